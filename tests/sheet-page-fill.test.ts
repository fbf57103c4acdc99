import { execFileSync } from 'node:child_process';
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { TrussModel } from '@shared/model/truss';
import { trussSolve } from '@shared/solver';
import { buildCalcSheetView, type CalcSheetInput } from '../server/modules/calc-sheets/calc-sheet-view';
import { renderCalcSheetHtml } from '../server/modules/calc-sheets/calc-sheet-html';
import { createSheetPrinter, type SheetPrinter } from '../server/modules/calc-sheets/sheet-printer';
import { demoTruss, withTakeoff } from './support/sheet-samples';

/**
 * No page holds only a short table when the next section fits: an issued sheet with a long firm
 * name, a two-line address and an 80-character project (US Letter), whose cover runs over one
 * page, printed by the real Chromium and read back with poppler's pdftotext. The signature table
 * that spills onto page 2 has the design basis after it, not an empty page. Values invented.
 * PAGE_FILL_KEEP=<folder> keeps the page images (pdftoppm) to look at.
 */

const CHROMIUM = process.env.CHROMIUM_PATH ?? '/usr/bin/chromium';

function issuedInput(): CalcSheetInput {
  const { model, takeoffSteps } = withTakeoff(demoTruss(), 'exact', 4.5);
  const withCombos: TrussModel = {
    ...model,
    combinations: [
      { name: '1.4D', factors: { D: 1.4 }, clause: 'ASCE/SEI 7-16 2.3.1 (1)' },
      { name: '1.2D + 1.6S', factors: { D: 1.2, S: 1.6 }, clause: 'ASCE/SEI 7-16 2.3.1 (3)' },
    ],
  };
  return {
    firm: {
      name: 'Fenwick-Albright Consolidated Timber & Light-Gauge Structural Engineers LLP',
      address: 'Unit 14B, The Old Ropeworks Business Quarter, 221–229 Lower Marshgate Road\nNorth Wharfside Industrial Estate, Port Ellismere PE17 4QX, United Kingdom',
      paperSize: 'Letter',
    },
    project: { name: 'Greyfriars Cross Regional Distribution Centre — Phase 2 warehouse roofs at bay 7', jobNumber: 'FAC-2026-00417-R', unitSystem: 'SI', designBasis: 'Timber trusses to the project specification.' },
    trussName: 'T14-GIRDER-A',
    subject: 'Truss T14-GIRDER-A (girder truss at gridline 7, double ply): analysis, member forces',
    revision: 'C',
    preparedBy: { name: 'Alexandra Montgomery-Whitfield', date: '2026-03-02' },
    checkedBy: { name: 'Oluwaseun Adebayo-Okafor', date: '2026-03-04' },
    issuedBy: { name: 'Alexandra Montgomery-Whitfield', date: '2026-03-05' },
    model: withCombos,
    analysis: trussSolve(withCombos),
    takeoffSteps,
    generatedAt: '2026-03-05T09:00:00Z',
    runLabel: 'Run 412 by Alexandra Montgomery-Whitfield, 2026-03-01',
    issue: { sheetId: 12345, fingerprint: '3fa9c2d1e0b4', fingerprintOf: 'issue record', verifyUrl: 'https://calculations.fenwick-albright-structural.example/verify/12345' },
  };
}

let printer: SheetPrinter;
let dir: string;
let pages: string[] = [];

beforeAll(async () => {
  printer = createSheetPrinter({ chromiumPath: CHROMIUM });
  dir = fs.mkdtempSync(path.join(os.tmpdir(), 'panelpoint-page-fill-'));
  const input = issuedInput();
  const file = path.join(dir, 'issued.pdf');
  await printer.printToFile(renderCalcSheetHtml(buildCalcSheetView(input)), input.firm.paperSize, file);
  if (process.env.PAGE_FILL_KEEP) execFileSync('pdftoppm', ['-r', '70', '-png', '-f', '1', '-l', '4', file, path.join(process.env.PAGE_FILL_KEEP, 'issued')]);
  pages = execFileSync('pdftotext', ['-layout', file, '-'], { encoding: 'utf8', maxBuffer: 64 * 1024 * 1024 }).split('\f').filter((p) => p.trim());
}, 240_000);

afterAll(async () => {
  await printer?.close();
  if (dir) fs.rmSync(dir, { recursive: true, force: true });
});

describe('page fill of an issued sheet', () => {
  it('when the cover with its signature table runs over one page, then the design basis follows the table on that page', () => {
    const withSignatures = pages.findIndex((p) => /Issued by\s+Alexandra/.test(p.split('\n').slice(6, -4).join('\n')));
    expect(withSignatures).toBeGreaterThanOrEqual(0);
    const page = pages[withSignatures];
    // The table, then section 1 on the same page, with its method lines.
    expect(page).toMatch(/Issued by[\s\S]*1\s+Design basis[\s\S]*Method/);
  });

  it('when printed, then no page but the last holds fewer than 40 words of body (a lone short table)', () => {
    for (let i = 0; i < pages.length - 1; i++) {
      // Body: what is left when the page head (first six lines) and footer (last four lines) are dropped.
      const body = pages[i].split('\n').filter((l) => l.trim()).slice(6, -4).join(' ');
      const words = body.split(/\s+/).filter(Boolean).length;
      expect(words, `page ${i + 1}: ${body.slice(0, 200)}`).toBeGreaterThanOrEqual(40);
    }
  });
});

import { execFileSync } from 'node:child_process';
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { trussSolve } from '@shared/solver';
import { modelFromSketch } from '@shared/solver/test-trusses';
import { buildCalcSheetView, type CalcSheetInput } from '../server/modules/calc-sheets/calc-sheet-view';
import { renderCalcSheetHtml } from '../server/modules/calc-sheets/calc-sheet-html';
import { notoCssFor } from '../server/modules/calc-sheets/sheet-assets';
import { createSheetPrinter, type SheetPrinter } from '../server/modules/calc-sheets/sheet-printer';

/**
 * Joint tags in Arabic, Hebrew, Devanagari and Cyrillic (as a drawing from an office abroad may
 * carry) print with the shipped Noto faces, embedded, and never with a system font or as
 * missing-glyph boxes. Checked with poppler's pdffonts and pdftotext on a real Chromium print.
 */
const CHROMIUM = process.env.CHROMIUM_PATH ?? '/usr/bin/chromium';
const TAGS = { arabic: 'عقدة', hebrew: 'צומת', devanagari: 'बिंदु', cyrillic: 'Узел' };

function input(tags: string[]): CalcSheetInput {
  // A simple triangle of 4 m span and 3 m rise, 10 kN down at the apex (invented example).
  const model = modelFromSketch({
    joints: [[tags[0], 0, 0], [tags[1], 4, 0], [tags[2], 2, 3]],
    members: [[tags[0], tags[1]], [tags[1], tags[2]], [tags[2], tags[0]]],
    supports: [{ at: tags[0], kind: 'pin' }, { at: tags[1], kind: 'roller' }],
    cases: [{ id: 'D', loads: [[tags[2], 0, -10]] }],
  });
  return {
    firm: { name: 'Orchard Lane Engineers (demo)', address: '12 Mill Row', paperSize: 'A4' },
    project: { name: 'Kiosk canopy', jobNumber: 'OL-1040', unitSystem: 'SI' },
    trussName: 'T2',
    subject: 'Truss T2 — member forces',
    revision: 'P1',
    model,
    analysis: trussSolve(model),
    generatedAt: '2026-05-11T08:00:00Z',
  };
}

describe('non-Latin tags on the calc sheet (real Chromium)', () => {
  let printer: SheetPrinter;
  let dir: string;
  let file: string;
  beforeAll(async () => {
    printer = createSheetPrinter({ chromiumPath: CHROMIUM });
    dir = fs.mkdtempSync(path.join(os.tmpdir(), 'pp-fonts-test-'));
    file = path.join(dir, 'tags.pdf');
    await printer.printToFile(renderCalcSheetHtml(buildCalcSheetView(input([`${TAGS.arabic}1`, `${TAGS.hebrew}2`, `${TAGS.devanagari}3`]))), 'A4', file);
  }, 180_000);
  afterAll(async () => {
    await printer?.close();
    if (dir) fs.rmSync(dir, { recursive: true, force: true });
  });

  it('when tags are Arabic, Hebrew and Devanagari, then pdffonts lists the three Noto faces, every font embedded and none from the system', () => {
    const out = execFileSync('pdffonts', [file], { encoding: 'utf8' });
    const rows = out.split('\n').slice(2).filter((l) => l.trim());
    for (const line of rows) {
      const cols = line.trim().split(/\s+/);
      expect(cols[cols.length - 5], line).toBe('yes');
      expect(cols[0], line).toMatch(/^[A-Z]{6}\+(Inter|KaTeX|NotoSans)/);
    }
    expect(out).toMatch(/NotoSansArabic/);
    expect(out).toMatch(/NotoSansHebrew/);
    expect(out).toMatch(/NotoSansDevanagari/);
  });

  it('when the text is taken back out of the PDF, then the Arabic and Hebrew tags are there as characters', () => {
    const text = execFileSync('pdftotext', [file, '-'], { encoding: 'utf8' });
    // pdftotext writes right-to-left words in logical order when the PDF maps glyphs to Unicode.
    const letters = (s: string) => [...s].filter((c) => /\p{L}/u.test(c)).join('');
    const all = letters(text);
    expect(all.includes(TAGS.arabic) || all.includes([...TAGS.arabic].reverse().join(''))).toBe(true);
    expect(all.includes(TAGS.hebrew) || all.includes([...TAGS.hebrew].reverse().join(''))).toBe(true);
    // U+FFFD or an empty-box character would mean a glyph went missing.
    expect(text).not.toMatch(/[\uFFFD\u25A1]/);
  });

  it('when a sheet is in Latin script alone, then no Noto face is inlined; with a Hebrew tag only the Hebrew faces are', () => {
    expect(notoCssFor(JSON.stringify(buildCalcSheetView(input(['A', 'B', 'C']))))).toBe('');
    const hebrew = notoCssFor(JSON.stringify(buildCalcSheetView(input([`${TAGS.hebrew}1`, 'B', 'C']))));
    expect(hebrew.match(/@font-face/g)).toHaveLength(2); // 400 and 700
    expect(hebrew).toMatch(/font-family:'Noto Sans Hebrew'/);
    expect(hebrew).not.toMatch(/Arabic|Devanagari/);
    const cyrillic = notoCssFor(TAGS.cyrillic);
    expect(cyrillic).toMatch(/font-family:'Noto Sans'/);
  });
});

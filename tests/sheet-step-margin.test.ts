import { execFileSync } from 'node:child_process';
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { TrussModel } from '@shared/model/truss';
import { trussSolve } from '@shared/solver';
import { modelFromSketch } from '@shared/solver/test-trusses';
import { buildCalcSheetView, type CalcSheetInput, type CalcSheetView, type StepView } from '../server/modules/calc-sheets/calc-sheet-view';
import { renderCalcSheetHtml } from '../server/modules/calc-sheets/calc-sheet-html';
import { createSheetPrinter, type SheetPrinter } from '../server/modules/calc-sheets/sheet-printer';
import { demoTruss, kTruss, withTakeoff } from './support/sheet-samples';

/**
 * Step numbers in the margin, as on a calc pad: every section's and step's number stands in a
 * left margin column (13 mm, templates/sheet.css --margin-col), left of the text it numbers and
 * inside the page's left margin line. Printed by the real Chromium and read back with poppler's
 * `pdftotext -bbox` (word boxes in points, origin top left). Page margins as page-setup.hbs sets
 * them (17 mm left); A4 210 × 297 mm (ISO 216), US Letter 8.5 × 11 in (ANSI/ASME Y14.1).
 * Trusses are our own (invented).
 */

const CHROMIUM = process.env.CHROMIUM_PATH ?? '/usr/bin/chromium';
const SLOW = 240_000;
const PT_PER_MM = 72 / 25.4;
const LEFT = 17 * PT_PER_MM;
const RIGHT = 15 * PT_PER_MM;
const COLUMN = 13 * PT_PER_MM;
/** Half a point: pdftotext's boxes are the glyphs' font boxes. */
const TOL = 0.5;

interface Word {
  text: string;
  x0: number;
  y0: number;
  x1: number;
  y1: number;
  page: number;
}

function words(file: string): { width: number; words: Word[] }[] {
  const xml = execFileSync('pdftotext', ['-bbox', file, '-'], { encoding: 'utf8', maxBuffer: 64 * 1024 * 1024 });
  return [...xml.matchAll(/<page width="([\d.]+)" height="([\d.]+)">([\s\S]*?)<\/page>/g)].map((m, page) => ({
    width: Number(m[1]),
    words: [...m[3].matchAll(/<word xMin="([\d.-]+)" yMin="([\d.-]+)" xMax="([\d.-]+)" yMax="([\d.-]+)">([^<]*)<\/word>/g)].map((w) => ({
      x0: Number(w[1]),
      y0: Number(w[2]),
      x1: Number(w[3]),
      y1: Number(w[4]),
      text: w[5].replace(/&amp;/g, '&'),
      page,
    })),
  }));
}

function input(model: TrussModel, paper: 'A4' | 'Letter', extra: Partial<CalcSheetInput> = {}): CalcSheetInput {
  return {
    firm: { name: 'Hollin Bank Structures (test)', address: '4 Quarry Lane', paperSize: paper },
    project: { name: 'Numbers in the margin', jobNumber: 'HB-0013', unitSystem: 'SI' },
    trussName: 'T1',
    subject: 'Truss T1',
    revision: 'A',
    model,
    analysis: trussSolve(model),
    generatedAt: '2026-12-03T10:00:00Z',
    ...extra,
  };
}

function stepsOf(view: CalcSheetView): StepView[] {
  return [
    view.stability,
    ...view.takeoff,
    ...view.cases.flatMap((c) => [...c.zeroForce.steps, ...c.reactionSteps, ...c.jointSteps, ...c.simultaneousSteps, ...c.stiffnessSteps, c.check]),
  ].filter((s): s is StepView => !!s);
}

const demo = withTakeoff(demoTruss(), 'exact', 4.5);
const SHEETS: [string, CalcSheetInput][] = [
  ['demo truss with a roof loading, A4', input(demo.model, 'A4', { takeoffSteps: demo.takeoffSteps })],
  ['K-truss, US Letter', input(modelFromSketch(kTruss()), 'Letter')],
];

describe('step numbers in the margin column', () => {
  let printer: SheetPrinter;
  let dir: string;
  const printed: Record<string, { view: CalcSheetView; pages: { width: number; words: Word[] }[] }> = {};

  beforeAll(async () => {
    printer = createSheetPrinter({ chromiumPath: CHROMIUM });
    dir = fs.mkdtempSync(path.join(os.tmpdir(), 'panelpoint-margin-'));
    for (const [name, inp] of SHEETS) {
      const view = buildCalcSheetView(inp);
      const file = path.join(dir, `${name.replace(/\W+/g, '-')}.pdf`);
      await printer.printToFile(renderCalcSheetHtml(view), inp.firm.paperSize, file);
      if (process.env.MARGIN_KEEP) execFileSync('pdftoppm', ['-r', '70', '-png', file, path.join(process.env.MARGIN_KEEP, name.replace(/\W+/g, '-'))]);
      printed[name] = { view, pages: words(file) };
    }
  }, SLOW);

  afterAll(async () => {
    await printer?.close();
    if (dir) fs.rmSync(dir, { recursive: true, force: true });
  });

  /** Every place a number is printed with the first word of a title right after it on its line. */
  function placedAll(name: string, number: string, title: string): { no: Word; first: Word; width: number }[] {
    const firstWord = title.split(/\s+/)[0];
    const out: { no: Word; first: Word; width: number }[] = [];
    for (const p of printed[name].pages) {
      for (const no of p.words.filter((w) => w.text === number)) {
        const line = p.words.filter((w) => w !== no && Math.abs((w.y0 + w.y1) / 2 - (no.y0 + no.y1) / 2) < 3 && w.x0 > no.x0).sort((a, b) => a.x0 - b.x0);
        if (line[0]?.text === firstWord) out.push({ no, first: line[0], width: p.width });
      }
    }
    return out;
  }
  const placed = (name: string, number: string, title: string) => placedAll(name, number, title)[0] ?? null;

  it.each(SHEETS.map(([n]) => [n]))('when the %s sheet is printed, then every step number stands in the margin column, left of its title and inside the page', (name) => {
    const steps = stepsOf(printed[name].view);
    expect(steps.length).toBeGreaterThan(5);
    for (const s of steps) {
      const at = placed(name, s.number!, s.title);
      expect(at, `step ${s.number} ${s.title}`).not.toBeNull();
      const { no, first, width } = at!;
      // Inside the page's text area: not left of the left margin line, and not past the right one.
      expect(no.x0, `${s.number}`).toBeGreaterThanOrEqual(LEFT - TOL);
      expect(no.x1, `${s.number}`).toBeLessThanOrEqual(width - RIGHT + TOL);
      // In the margin column, and the step's title to the right of the column.
      expect(no.x1, `${s.number}`).toBeLessThan(LEFT + COLUMN - 1);
      expect(first.x0, `${s.number}`).toBeGreaterThanOrEqual(LEFT + COLUMN - TOL);
      expect(first.x0 - no.x1, `${s.number}`).toBeGreaterThan(2);
    }
  });

  it.each(SHEETS.map(([n]) => [n]))('when the %s sheet is printed, then each section number stands in the same column as its steps\' numbers, after the contents line that gives the same number', (name) => {
    const { view } = printed[name];
    const steps = stepsOf(view);
    const stepColumn = placed(name, steps[0].number!, steps[0].title)!.no.x0;
    const sections = [...view.cover.contents.filter((c) => view.numbers[c.anchor])];
    expect(sections.length).toBeGreaterThan(4);
    // Section headings print the title of the contents line (the contents may add words after it).
    for (const c of sections) {
      const at = placedAll(name, view.numbers[c.anchor], c.title);
      // Once in the contents on the cover (page 1), then at the section's heading.
      expect(at.length, c.title).toBeGreaterThanOrEqual(2);
      expect(at[0].no.page, c.title).toBe(0);
      const heading = at[at.length - 1];
      expect(heading.no.page, c.title).toBeGreaterThan(0);
      expect(heading.no.x0, c.title).toBeGreaterThanOrEqual(LEFT - TOL);
      expect(Math.abs(heading.no.x0 - stepColumn), c.title).toBeLessThan(1);
      expect(heading.first.x0, c.title).toBeGreaterThanOrEqual(LEFT + COLUMN - TOL);
    }
  });
});

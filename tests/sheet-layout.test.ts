import { execFileSync } from 'node:child_process';
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { trussSolve } from '@shared/solver';
import { modelFromSketch, parallelChordSketch, type TrussSketch } from '@shared/solver/test-trusses';
import { buildCalcSheetView, type CalcSheetInput } from '../server/modules/calc-sheets/calc-sheet-view';
import { renderCalcSheetHtml } from '../server/modules/calc-sheets/calc-sheet-html';
import { createSheetPrinter, type SheetPrinter } from '../server/modules/calc-sheets/sheet-printer';

/**
 * Nothing cut off, nothing overprinted: sheets with long values (a long firm name and a two-line
 * address, an 80-character project name, a long truss name and subject, an issued stamp with a
 * long verify address), a K-truss with its simultaneous-solve paragraph and a stiffness solution
 * with its long load vector, on A4 and US Letter, printed by the real Chromium and read back with
 * `pdftotext -bbox` (poppler): every word's box must lie on the page's printable area, body text
 * inside the side margins, the page head and footer inside their margins, and no word of the head
 * or footer may overlap another word.
 *
 * Paper sizes: A4 210 × 297 mm (ISO 216), US Letter 8.5 × 11 in (ANSI/ASME Y14.1). The
 * printable area is the page less 6 mm at each edge, what most office printers cannot print on
 * (common practice, no source). Margins as page-setup.hbs sets them: 31 mm top, 15 mm right,
 * 17 mm bottom (21 mm on an issued sheet, whose footer carries the stamp), 17 mm left.
 */

const CHROMIUM = process.env.CHROMIUM_PATH ?? '/usr/bin/chromium';
const SLOW = 240_000;
const PT_PER_MM = 72 / 25.4;
const EDGE = 6 * PT_PER_MM;
const MARGIN = { top: 31 * PT_PER_MM, right: 15 * PT_PER_MM, bottom: 17 * PT_PER_MM, left: 17 * PT_PER_MM };
/** An issued sheet's footer has a second line (the stamp): its bottom margin is 21 mm. */
const ISSUED_BOTTOM = 21 * PT_PER_MM;
const bottomOf = (p: Page) => (p.issued ? ISSUED_BOTTOM : MARGIN.bottom);
/** Half a point: pdftotext's boxes are the glyphs' font boxes, which may touch at a line's edge. */
const TOL = 0.5;

const LONG_FIRM = {
  name: 'Fenwick-Albright Consolidated Timber & Light-Gauge Structural Engineers LLP',
  address: 'Unit 14B, The Old Ropeworks Business Quarter, 221–229 Lower Marshgate Road\nNorth Wharfside Industrial Estate, Port Ellismere PE17 4QX, United Kingdom',
};
// 80 characters exactly (checked below).
const LONG_PROJECT = 'Greyfriars Cross Regional Distribution Centre — Phase 2 warehouse roofs at bay 7';

function kTruss(): TrussSketch {
  // Four panels of 3 m, depth 4 m, a K in each of the first panels, as in calc-sheet-arithmetic.test.ts (invented geometry).
  const a = 3;
  const h = 4;
  const joints: [string, number, number][] = [];
  for (let i = 0; i <= 4; i++) joints.push([`L${i}`, i * a, 0], [`U${i}`, i * a, h]);
  for (let i = 1; i <= 3; i++) joints.push([`M${i}`, i * a, h / 2]);
  const members: [string, string][] = [];
  for (let i = 0; i < 4; i++) members.push([`L${i}`, `L${i + 1}`], [`U${i}`, `U${i + 1}`]);
  members.push(['L0', 'U0'], ['L4', 'U4']);
  for (let i = 1; i <= 3; i++) members.push([`L${i}`, `M${i}`], [`M${i}`, `U${i}`]);
  members.push(['U0', 'M1'], ['L0', 'M1'], ['U1', 'M2'], ['L1', 'M2'], ['M2', 'L3'], ['M3', 'U4'], ['M3', 'L4']);
  return {
    joints,
    members,
    supports: [{ at: 'L0', kind: 'pin' }, { at: 'L4', kind: 'roller' }],
    cases: [{ id: 'D', loads: [['U1', 0, -17.3], ['U2', 0, -17.3], ['U3', 0, -17.3], ['L2', 2.9, -6.1]] }],
  };
}

function longInput(model: CalcSheetInput['model'], paper: 'A4' | 'Letter', issued: boolean): CalcSheetInput {
  return {
    firm: { ...LONG_FIRM, paperSize: paper },
    project: { name: LONG_PROJECT, jobNumber: 'FAC-2026-00417-R', unitSystem: 'SI' },
    trussName: 'T14-GIRDER-A',
    subject: 'Truss T14-GIRDER-A (girder truss at gridline 7, double ply): analysis, member forces',
    revision: 'C',
    preparedBy: { name: 'Alexandra Montgomery-Whitfield', date: '2026-03-02' },
    checkedBy: { name: 'Oluwaseun Adebayo-Okafor', date: '2026-03-04' },
    ...(issued ? { issuedBy: { name: 'Alexandra Montgomery-Whitfield', date: '2026-03-05' } } : {}),
    model,
    analysis: trussSolve(model),
    generatedAt: '2026-03-05T09:00:00Z',
    runLabel: 'Run 412 by Alexandra Montgomery-Whitfield, 2026-03-01',
    issue: issued
      ? { sheetId: 12345, fingerprint: '3fa9c2d1e0b4', fingerprintOf: 'issue record', verifyUrl: 'https://calculations.fenwick-albright-structural.example/verify/12345' }
      : null,
  };
}

interface Word {
  text: string;
  x0: number;
  y0: number;
  x1: number;
  y1: number;
}
interface Page {
  issued?: boolean;
  width: number;
  height: number;
  words: Word[];
}

/** Word boxes per page from poppler's `pdftotext -bbox` (points, origin top left). */
function bboxPages(file: string): Page[] {
  const xml = execFileSync('pdftotext', ['-bbox', file, '-'], { encoding: 'utf8', maxBuffer: 64 * 1024 * 1024 });
  const pages: Page[] = [];
  for (const m of xml.matchAll(/<page width="([\d.]+)" height="([\d.]+)">([\s\S]*?)<\/page>/g)) {
    const words = [...m[3].matchAll(/<word xMin="([\d.-]+)" yMin="([\d.-]+)" xMax="([\d.-]+)" yMax="([\d.-]+)">([^<]*)<\/word>/g)].map((w) => ({
      x0: Number(w[1]),
      y0: Number(w[2]),
      x1: Number(w[3]),
      y1: Number(w[4]),
      text: w[5].replace(/&amp;/g, '&'),
    }));
    pages.push({ width: Number(m[1]), height: Number(m[2]), words });
  }
  return pages;
}

const overlap = (a: Word, b: Word) => Math.min(a.x1, b.x1) - Math.max(a.x0, b.x0) > TOL && Math.min(a.y1, b.y1) - Math.max(a.y0, b.y0) > TOL;
const where = (w: Word, i: number) => `page ${i + 1}: "${w.text}" at (${w.x0.toFixed(1)}, ${w.y0.toFixed(1)})–(${w.x1.toFixed(1)}, ${w.y1.toFixed(1)})`;

/** Every rule of the layout on every page; the list of breaches (empty when the sheet fits). */
function layoutBreaches(pages: Page[]): string[] {
  const bad: string[] = [];
  pages.forEach((p, i) => {
    // The head and footer sit in the margins, 5 mm and 3 mm clear of the body; a body line's
    // glyph boxes (a fraction's numerator) may reach a point or two into the margin above it.
    const head = p.words.filter((w) => w.y0 < MARGIN.top - 4 * PT_PER_MM);
    const foot = p.words.filter((w) => w.y1 > p.height - bottomOf(p) + 2 * PT_PER_MM);
    const body = p.words.filter((w) => !head.includes(w) && !foot.includes(w));
    for (const w of p.words) {
      if (w.x0 < EDGE - TOL || w.y0 < EDGE - TOL || w.x1 > p.width - EDGE + TOL || w.y1 > p.height - EDGE + TOL) bad.push(`off the printable area: ${where(w, i)}`);
    }
    for (const w of [...head, ...foot]) {
      if (w.y1 > MARGIN.top + TOL && head.includes(w)) bad.push(`page head runs into the body: ${where(w, i)}`);
      if (w.y0 < p.height - bottomOf(p) - TOL && foot.includes(w)) bad.push(`footer runs into the body: ${where(w, i)}`);
    }
    for (const w of body) {
      if (w.x0 < MARGIN.left - TOL || w.x1 > p.width - MARGIN.right + TOL) bad.push(`body text outside the side margins: ${where(w, i)}`);
    }
    for (const group of [head, foot]) {
      for (let a = 0; a < group.length; a++) {
        for (const other of [...group.slice(a + 1), ...body]) {
          if (overlap(group[a], other)) bad.push(`overprinted: ${where(group[a], i)} and "${other.text}"`);
        }
      }
    }
  });
  return bad;
}

describe('calc sheet with long values: nothing cut off, nothing overprinted', () => {
  let printer: SheetPrinter;
  let dir: string;
  const printed: Record<string, Page[]> = {};
  const stiffness = () => {
    const s = parallelChordSketch('pratt', 8, 2.35, 1.85, 23.7);
    return modelFromSketch({ ...s, supports: [{ at: 'L0', kind: 'pin' }, { at: 'L8', kind: 'pin' }], EA: 213_400 });
  };
  const cases: [string, () => CalcSheetInput][] = [
    ['stiffness, A4, issued', () => longInput(stiffness(), 'A4', true)],
    ['K-truss, US Letter, issued', () => longInput(modelFromSketch(kTruss()), 'Letter', true)],
    ['K-truss, A4, draft', () => longInput(modelFromSketch(kTruss()), 'A4', false)],
  ];

  beforeAll(async () => {
    expect(LONG_PROJECT.length).toBe(80);
    printer = createSheetPrinter({ chromiumPath: CHROMIUM });
    dir = fs.mkdtempSync(path.join(os.tmpdir(), 'panelpoint-layout-'));
    for (const [name, make] of cases) {
      const input = make();
      const file = path.join(dir, `${name.replace(/\W+/g, '-')}.pdf`);
      await printer.printToFile(renderCalcSheetHtml(buildCalcSheetView(input)), input.firm.paperSize, file);
      if (process.env.LAYOUT_KEEP) execFileSync('pdftoppm', ['-r', '60', '-png', file, path.join(process.env.LAYOUT_KEEP, name.replace(/\W+/g, '-'))]);
      printed[name] = bboxPages(file).map((p) => ({ ...p, issued: Boolean(input.issue) }));
    }
  }, SLOW);

  afterAll(async () => {
    await printer?.close();
    if (dir) fs.rmSync(dir, { recursive: true, force: true });
  });

  it.each(cases.map(([name]) => [name]))('when the %s sheet is printed, then no word lies off the printable area, outside its margins, or over another', (name) => {
    const pages = printed[name];
    expect(pages.length).toBeGreaterThan(3);
    expect(layoutBreaches(pages)).toEqual([]);
  });

  it.each(cases.map(([name]) => [name]))('when the %s sheet is printed, then the head carries the whole firm, address, project and sheet number on every page, and the page is not shrunk to fit', (name) => {
    const pages = printed[name];
    pages.forEach((p, i) => {
      const head = p.words.filter((w) => w.y0 < MARGIN.top).map((w) => w.text).join(' ');
      for (const part of [LONG_FIRM.name, ...LONG_FIRM.address.split('\n'), LONG_PROJECT, `Sheet ${i + 1} of ${pages.length}`]) {
        expect(head.replace(/\s+/g, ' '), `page ${i + 1}`).toContain(part);
      }
    });
    // A page whose content is too wide is shrunk as a whole by Chromium, which would hide an
    // overflow: the 13 pt section headings must print at 13 pt (Inter's box is 1.21 em tall, measured).
    const tallest = Math.max(...pages.flatMap((p) => p.words).filter((w) => w.text === 'Design').map((w) => w.y1 - w.y0));
    expect(tallest).toBeGreaterThan(13 * 1.21 * 0.97);
  });

  it('when the checks are given a page with a word past the right margin or a head word over the body, then they name it (the checks can fail)', () => {
    const page: Page = {
      width: 595,
      height: 842,
      words: [
        { text: 'inside', x0: 60, y0: 200, x1: 100, y1: 210 },
        { text: '−23.700,', x0: 540, y0: 300, x1: 580, y1: 310 },
        { text: 'Firm', x0: 60, y0: 70, x1: 90, y1: 95 },
        { text: 'Job', x0: 80, y0: 70, x1: 100, y1: 80 },
      ],
    };
    const breaches = layoutBreaches([page]);
    expect(breaches.some((b) => b.includes('−23.700,') && b.startsWith('body text outside'))).toBe(true);
    expect(breaches.some((b) => b.includes('"Firm"') && b.startsWith('page head runs into the body'))).toBe(true);
    expect(breaches.some((b) => b.startsWith('overprinted') && b.includes('"Firm"'))).toBe(true);
  });
});

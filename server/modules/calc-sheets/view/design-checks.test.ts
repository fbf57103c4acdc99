import { undefinedIn } from '@shared/design/symbols';
import { describe, expect, it } from 'vitest';
import { runDesign } from '@shared/design/basis';
import type { DesignInput } from '@shared/model/design-input';
import { trussSolve } from '@shared/solver';
import { buildCalcSheetView } from './index';
import { renderCalcSheetHtml } from '../calc-sheet-html';
import { sheetInput, TRIANGLE_FORCES, triangleModel } from './view-fixtures';

/**
 * The 3-4-5 triangle of view-fixtures (case D: rafters AC = BC = −10 kN, tie AB = +8 kN by the
 * method of joints) designed by AISC 360-16 LRFD with A992 (Fy 50 ksi = 344.74 MPa, E 29 000 ksi) and a
 * section by properties A = 1000 mm², rx = ry = 30 mm. Expected values written out here from
 * AISC 360-16 D1, D2(a), E2 and E3 (the standard's published formulas):
 *   rafters: Lc/r = 5000/30 = 166.67 > 4.71√(E/Fy) = 113.4, so Fcr = 0.877·π²E/(Lc/r)² (E3-3);
 *            ratio max(10/(0.9·Fcr·A), 166.67/200 = 0.833)
 *   tie:     L/r = 8000/30 = 266.67; ratio max(8/(0.9·344.74·1000/1000), 266.67/300 = 0.889)
 * MPa per ksi from the exact pound-force and inch (NIST SP 811): 4448.2216152605 N / 645.16 mm².
 */
const KSI = 4448.2216152605 / 645.16;
const design: DesignInput = {
  standard: 'aisc360-16-lrfd',
  groups: [
    { name: 'Rafters and tie', members: 'all', material: { kind: 'grade', grade: 'A992' }, section: { shape: 'properties', A: 1000, rx: 30, ry: 30 } },
  ],
};

function sheetWith(d: DesignInput) {
  const model = { ...triangleModel(['D']), design: d };
  const analysis = trussSolve(model);
  return buildCalcSheetView(sheetInput(model, { analysis, design: runDesign(model, analysis) }));
}

describe('sheet view: member design pages', () => {
  it('each group gets a page; the governing member (the tie, 0.889) has its every step and the others are in the table', () => {
    const view = sheetWith(design);
    expect(view.designChecks.present).toBe(true);
    expect(view.designChecks.standard).toBe('AISC 360-16, LRFD (φ)');
    const [g] = view.designChecks.groups;
    expect(view.cover.contents.map((c) => c.anchor)).toContain(g.anchor);
    const tieRatio = Math.max(TRIANGLE_FORCES.D.AB / ((0.9 * 50 * KSI * 1000) / 1000), 8000 / 30 / 300);
    expect(g.governing!.tag).toBe('AB');
    expect(g.governing!.line).toBe(`Governing member AB under D: utilisation ${Number(tieRatio.toPrecision(3))} ≤ 1.0, adequate.`);
    const clauses = g.governing!.steps.map((s) => s.cells[0]);
    expect(clauses).toEqual(expect.arrayContaining(['AISC 360-16 D2(a)', 'AISC 360-16 D2(b)', 'AISC 360-16 D3', 'AISC 360-16 D1 (user note)']));
    expect(g.governing!.steps.find((s) => s.cells[0] === 'AISC 360-16 D2(a)' && s.cells[2] === 'Pn = Fy·Ag')!.cells[4]).toBe('344.74 kN'); // 50 ksi × 1000 mm² = 344.738 kN
    // The rafters in the table: compression −10 kN, utilisation from the E2 slenderness.
    const Fe = (Math.PI ** 2 * 29_000 * KSI) / (5000 / 30) ** 2;
    const rafter = Math.max(10 / ((0.9 * 0.877 * Fe * 1000) / 1000), 5000 / 30 / 200);
    const ac = g.rows.find((r) => r.cells[0] === 'AC')!;
    expect(ac.cells.slice(1, 3)).toEqual(['—', '\u221210.00']);
    expect(ac.cells[5]).toBe(String(Number(rafter.toPrecision(3))));
    expect(ac.cells[6]).toBe('OK');
    expect(view.cover.summary.find((s) => s.label === 'Member design')!.value).toBe('AISC 360-16, LRFD (φ): every member adequate; largest utilisation 0.889 (AB)');
  });

  it('says what is not applied (E6 built-up members) and carries the engineer-of-record caution, also in the design basis', () => {
    const view = sheetWith(design);
    expect(view.designChecks.notApplied.join(' ')).toMatch(/AISC 360-16 §E6/);
    expect(view.designChecks.caution).toMatch(/edition of the standard and any National Annex .* verified by the engineer of record/);
    expect(view.caution).toContain(view.designChecks.caution);
  });

  it('defines, before the first group, every symbol the governing member’s printed formulas use', () => {
    // The formulas as the sheet prints them (column 3 of the steps table) against the list the
    // page prints above them (undefinedIn, shared/design/symbols.ts).
    const view = sheetWith(design);
    expect(view.designChecks.symbols.map((s) => s.symbol)).toEqual(expect.arrayContaining(['Ag', 'Fy, Fu', 'Pn']));
    const formulas = view.designChecks.groups.flatMap((g) => g.governing?.steps ?? []).map((s) => s.cells[2]).filter(Boolean);
    expect(formulas).toContain('Pn = Fy·Ag');
    expect(formulas.flatMap((f) => undefinedIn(f, view.designChecks.symbols))).toEqual([]);
  });

  it('a slender tie fails with its limit written, and the cover says so', () => {
    const view = sheetWith({ ...design, groups: [{ ...design.groups[0], section: { shape: 'properties', A: 1000, rx: 20, ry: 20 } }] });
    const ab = view.designChecks.groups[0].rows.find((r) => r.cells[0] === 'AB')!;
    expect(ab.cells[5]).toBe(String(Number((8000 / 20 / 300).toPrecision(3))));
    expect(ab.cells[6]).toBe('FAILS');
    expect(view.cover.summary.find((s) => s.label === 'Member design')!.value).toMatch(/3 members FAIL/);
  });

  it('a sheet without a member design has no design pages, and the caution is the analysis one alone', () => {
    const view = buildCalcSheetView(sheetInput(triangleModel(['D'])));
    expect(view.designChecks.present).toBe(false);
    expect(view.cover.contents.some((c) => c.anchor.startsWith('design-1'))).toBe(false);
    expect(view.caution).not.toMatch(/engineer of record/);
  });

  it('the HTML carries the pages in order: forces, deflection, design, residual', () => {
    const model = { ...triangleModel(['D']), design: { ...design, deflection: { joints: [triangleModel().joints.find((j) => j.tag === 'C')!.id], combinations: ['D'], limit: 240 } } };
    const analysis = trussSolve(model);
    const html = renderCalcSheetHtml(buildCalcSheetView(sheetInput(model, { analysis, design: runDesign(model, analysis) })));
    const at = (id: string) => html.indexOf(`id="${id}"`);
    expect(at('deflection')).toBeGreaterThan(0);
    expect(at('design-1')).toBeGreaterThan(at('deflection'));
    expect(at('residual')).toBeGreaterThan(at('design-1'));
  });

  it('a US customary project: the design and deflection pages print ksi, in², in and kip, never MPa, mm or kN; the rafter worked by hand in ksi (AISC 360-16 E3)', () => {
    const C = triangleModel().joints.find((j) => j.tag === 'C')!.id;
    const model = { ...triangleModel(['D']), design: { ...design, groups: [{ ...design.groups[0], members: 'all' as const }], deflection: { joints: [C], combinations: ['D'], limit: 240 } } };
    const analysis = trussSolve(model);
    const view = buildCalcSheetView(sheetInput(model, { project: { name: 'P', jobNumber: 'J', unitSystem: 'US' }, analysis, design: runDesign(model, analysis) }));
    const html = renderCalcSheetHtml(view);
    const pages = html.slice(html.indexOf('id="deflection"'), html.indexOf('id="residual"')).replace(/<svg[\s\S]*?<\/svg>/g, '').replace(/<[^>]+>/g, ' ');
    expect(pages).toMatch(/ksi/);
    expect(pages).toMatch(/in²/);
    expect(pages).toMatch(/Tension \(kip\)/);
    expect(pages).toMatch(/δy \(in\)/);
    expect(pages).not.toMatch(/MPa|mm²|\bmm\b|\bkN\b/);
    expect(pages).not.toMatch(/as the standards’ formulas are written/);
    const [g] = view.designChecks.groups;
    // A992 preset: 50 ksi, 65 ksi, 29 000 ksi exactly; A = 1000 mm² = 1000/645.16 in² (1 in = 25.4 mm).
    expect(g.basis[0].value).toMatch(/^A992: Fy = 50 ksi, Fu = 65 ksi, E = 29000 ksi/);
    expect(g.basis[1].value).toMatch(/A = 1\.55 in², rx = 1\.1811 in/);
    // The governing tie in ksi: Pn = Fy·Ag = 50 ksi × 1.55 in² = 77.5 kips (AISC 360-16 D2(a)).
    const yielding = g.governing!.steps.find((r) => r.cells[0] === 'AISC 360-16 D2(a)' && r.cells[2] === 'Pn = Fy·Ag')!;
    expect(yielding.cells[3]).toMatch(/^50 ksi × 1\.55\d* in²$/);
    expect(yielding.cells[4]).toBe(`${Number((50 * (1000 / 645.16)).toPrecision(5))} kip`);
    // The rafters in the table, −10 kN = −2.25 kips (10 / 4.4482216152605), and their utilisation
    // from AISC 360-16 E3 by hand in ksi: Lc/r = 5000/30, Fe = π²·29 000/(Lc/r)², Fcr = 0.877·Fe (E3-3).
    const ac = g.rows.find((r) => r.cells[0] === 'AC')!;
    expect(ac.cells[2]).toBe(`\u2212${(10 / 4.4482216152605).toFixed(2)}`);
    const FeKsi = (Math.PI ** 2 * 29_000) / (5000 / 30) ** 2;
    const phiPnKips = 0.9 * 0.877 * FeKsi * (1000 / 645.16);
    expect(ac.cells[5]).toBe(String(Number(Math.max(10 / 4.4482216152605 / phiPnKips, 5000 / 30 / 200).toPrecision(3))));
    expect(view.deflection.note).toMatch(/N in kip, L in in, A in in², E in ksi/);
  });
});

import { describe, expect, it } from 'vitest';
import { trussSolve } from '@shared/solver';
import { modelFromSketch, parallelChordSketch } from '@shared/solver/test-trusses';
import { numberFormat } from '@shared/units';
import { roofTakeoff } from '@shared/takeoff';
import { buildCalcSheetView, type CalcSheetInput } from '../server/modules/calc-sheets/calc-sheet-view';
import { renderCalcSheetHtml, cssString } from '../server/modules/calc-sheets/calc-sheet-html';

// Parallel-chord Pratt truss, n panels of a, depth h, P at each interior bottom joint.
// Closed forms by the method of sections (Hibbeler, Structural Analysis, ch. 3, method of
// sections): R = (n − 1)P/2 at each end; the top chord cut opposite the
// mid-span joint carries −M_mid/h with M_mid = P·a·n²/8.
const n = 6;
const a = 3;
const h = 4;
const P = 10;
const R = ((n - 1) * P) / 2;
const topChordMid = -(P * a * n * n) / 8 / h;

function input(overrides: Partial<CalcSheetInput> = {}): CalcSheetInput {
  const model = modelFromSketch(parallelChordSketch('pratt', n, a, h, P));
  return {
    firm: { name: 'Harrow & Vale Structural (demo)', address: '4 Tanner’s Yard', paperSize: 'A4' },
    project: { name: 'Kestrel Logistics — warehouse roof', jobNumber: 'HV-2417', unitSystem: 'SI' },
    trussName: 'T1',
    subject: 'Truss T1',
    revision: 'A',
    model,
    analysis: trussSolve(model),
    generatedAt: '2026-03-02T10:15:00Z',
    ...overrides,
  };
}

describe('calc sheet view', () => {
  it('when a Pratt truss is built into a view, then the reactions read (n − 1)P/2 with two decimals in kN', () => {
    const view = buildCalcSheetView(input());
    const rows = view.cases[0].reactionRows.map((r) => r.cells);
    expect(rows).toEqual([
      ['L0', 'Pin', '0.00', numberFormat(R, 2), numberFormat(R, 2)],
      ['L6', 'Roller', '0.00', numberFormat(R, 2), numberFormat(R, 2)],
    ]);
  });

  it('when the mid-span top chord is in compression, then its row reads −M/h with a minus sign and (C)', () => {
    const view = buildCalcSheetView(input());
    const row = view.cases[0].forceRows.find((r) => r.cells[0] === 'U2U3');
    expect(row?.cells[3]).toBe(numberFormat(topChordMid, 2)); // "−33.75" with U+2212
    expect(row?.cells[4]).toBe('(C)');
    const bottom = view.cases[0].forceRows.find((r) => r.cells[0] === 'L0L1');
    // End bottom chord of a Pratt under vertical load carries nothing (method of joints at the bearing: the post is collinear with the reaction).
    expect(bottom?.cells[3]).toBe('0.00');
    expect(bottom?.cls).toBe('zero');
  });

  it('when the project is in US customary units, then reactions are converted to kip from the exact definition', () => {
    const view = buildCalcSheetView(input({ project: { name: 'X', jobNumber: 'J', unitSystem: 'US' } }));
    // 1 kip = 1000 lbf = 4.4482216152605 kN (NIST SP 811, exact by definition of the pound-force).
    expect(view.cases[0].reactionRows[0].cells[3]).toBe((R / 4.4482216152605).toFixed(2));
    expect(view.units.force).toBe('kip');
    expect(view.units.note).toMatch(/kN and m/);
  });

  it('when steps are rendered, then each carries the solver step id as anchor and every id is unique', () => {
    const analysis = input().analysis;
    const view = buildCalcSheetView(input());
    const c = view.cases[0];
    expect(c.jointSteps.map((s) => s.id)).toEqual(analysis.cases[0].jointSteps.map((s) => s.id));
    const ids = [view.stability.id, ...c.zeroForce.steps.map((s) => s.id), ...c.reactionSteps.map((s) => s.id), ...c.jointSteps.map((s) => s.id), c.check.id];
    expect(new Set(ids).size).toBe(ids.length);
    const html = renderCalcSheetHtml(view);
    for (const id of ids) expect(html).toContain(`id="${id}"`);
  });

  it('when equations are rendered, then they are KaTeX HTML (no raw TeX left) and each joint step has a free-body diagram', () => {
    const view = buildCalcSheetView(input());
    const step = view.cases[0].jointSteps[0];
    expect(step.lines.every((l) => l.includes('class="katex"'))).toBe(true);
    expect(step.lines.join('')).not.toMatch(/\\Sigma|\\mathrm/);
    expect(step.svg).toMatch(/^<svg class="fbd"/);
  });

  it('when the HTML is rendered, then KaTeX and Inter fonts are inlined as data: URIs and no relative font URL is left', () => {
    const html = renderCalcSheetHtml(buildCalcSheetView(input()));
    expect(html).toMatch(/font-family:KaTeX_Main;[^}]*src:url\(data:font\/woff2;base64,/);
    expect(html).toMatch(/font-family:'Inter';[^}]*src:url\(data:font\/woff2;base64,/);
    expect(html).not.toMatch(/url\((?!data:)["']?[^)"']*\.(woff2?|ttf)/);
  });

  it('when a title-block field has quotes, backslashes or a line break, then the page-margin CSS string stays closed', () => {
    expect(cssString('A "B" \\ C\nD')).toBe('A \\"B\\" \\\\ C D');
    const html = renderCalcSheetHtml(buildCalcSheetView(input({ subject: 'Truss "T1" \\ end' })));
    expect(html).toContain('Truss \\"T1\\" \\\\ end');
  });

  it('when the truss is unstable, then the view has no cases, names the mechanism joints and the HTML has no force table', () => {
    const model = modelFromSketch({
      joints: [['A', 0, 0], ['B', 4, 0], ['C', 4, 3], ['D', 0, 3]],
      members: [['A', 'B'], ['B', 'C'], ['C', 'D'], ['D', 'A']],
      supports: [{ at: 'A', kind: 'pin' }, { at: 'B', kind: 'roller' }],
      cases: [{ id: 'W', loads: [['D', 5, 0]] }],
    });
    const view = buildCalcSheetView(input({ model, analysis: trussSolve(model) }));
    expect(view.unstable).toBe(true);
    expect(view.cases).toEqual([]);
    // A four-bar panel without a diagonal: m + r = 4 + 3 = 7 < 2j = 8 (a mechanism by count alone).
    expect(view.stability.mechanism).toMatch(/C/);
    const html = renderCalcSheetHtml(view);
    expect(html).not.toMatch(/Member forces, case/);
    expect(html).toMatch(/Unstable/);
  });

  it('when the loads come from a roof loading, then every takeoff step is typeset under its own anchor with the purlin line load', () => {
    const base = input();
    const top = base.model.joints.filter((j) => j.tag.startsWith('U'));
    const takeoff = roofTakeoff({
      joints: base.model.joints,
      topChordJoints: top.map((j) => j.id),
      areaLoads: [{ caseId: 'D', q: 0.9, basis: 'plan' }],
      spacing: 4.5,
      trussCount: 8,
      trussIndex: 1,
      method: 'exact',
    });
    const view = buildCalcSheetView(input({ takeoffSteps: takeoff.steps }));
    expect(view.takeoff.map((s) => s.id)).toEqual(takeoff.steps.map((s) => s.id));
    expect(view.takeoff.every((s) => s.lines.length === s.tex.length && s.lines.length >= 1 && s.lines.every((l) => l.includes('class="katex"')))).toBe(true);
    const html = renderCalcSheetHtml(view);
    for (const s of takeoff.steps) expect(html).toContain(`id="${s.id}"`);
    // An interior purlin takes half of each 3 m panel on plan: b = 3 m, w = q·b = 0.9 × 3 = 2.70 kN/m
    // (tributary width, common practice, no source).
    const line = view.takeoff.find((s) => s.id === takeoff.steps.find((t) => t.kind === 'line-load' && t.jointTag === 'U3')?.id);
    expect(line?.lines[0]).toContain('2.70');
    expect(view.numbers.takeoff).toBe('4');
  });
});

import { describe, expect, it } from 'vitest';
import type { Combination } from '@shared/model/truss';
import { renderCalcSheetHtml } from '../calc-sheet-html';
import { buildCalcSheetView } from './index';
import { KN_PER_KIP, printed, sheetInput, TRIANGLE, TRIANGLE_REACTIONS, triangleModel } from './view-fixtures';

/**
 * Reactions of the 3-4-5 triangle (pin A, roller B) from global equilibrium, closed form in
 * view-fixtures (D: P/2 at each support; W: R_Ax = −H, R_Ay = −H·h/L, R_By = +H·h/L), and the
 * combinations by superposition (a linear elastic truss: any statics text, from memory).
 */
const COMBOS: Combination[] = [
  { name: 'U1', factors: { D: 1.4 } },
  { name: 'U2', factors: { D: 1.2, W: 1.5 } },
  { name: 'U3', factors: { D: 0.9, W: 1.5 } },
];
type S = 'A' | 'B';
const comboReaction = (c: Combination, s: S, k: 'rx' | 'ry') =>
  (c.factors.D ?? 0) * TRIANGLE_REACTIONS.D[s][k] + (c.factors.W ?? 0) * TRIANGLE_REACTIONS.W[s][k];
/** Largest and least over the combinations, the first combination winning ties (as the table lists them). */
function extreme(s: S, k: 'rx' | 'ry', sign: 1 | -1) {
  let best = { name: COMBOS[0].name, v: comboReaction(COMBOS[0], s, k) };
  for (const c of COMBOS.slice(1)) {
    const v = comboReaction(c, s, k);
    if (sign * (v - best.v) > 1e-12) best = { name: c.name, v };
  }
  return best;
}

describe('sheet view: reactions for bearing design', () => {
  it('when three combinations act on the triangle, then each support component shows its largest and least value with the combination that gives it', () => {
    const view = buildCalcSheetView(sheetInput(triangleModel(['D', 'W'], COMBOS)));
    expect(view.bearings.source).toBe('over the combinations');
    const expected = (['A', 'B'] as S[]).flatMap((s) =>
      (['rx', 'ry'] as const).map((k) => {
        const max = extreme(s, k, 1);
        const min = extreme(s, k, -1);
        return [printed(max.v, 2), max.name, printed(min.v, 2), min.name];
      }),
    );
    expect(view.bearings.extremes.map((r) => r.cells.slice(3))).toEqual(expected);
    expect(view.bearings.extremes.map((r) => r.cells.slice(0, 3))).toEqual([
      ['A', 'Pin', 'Rx'],
      ['', '', 'Ry'],
      ['B', 'Roller, reaction at 90°', 'Rx'],
      ['', '', 'Ry'],
    ]);
    // By hand: A's R_y is 1.4·6 = 8.40 under U1 at most and 0.9·6 − 1.5·1.5 = 3.15 under U3 at least: no uplift.
    expect(expected[1]).toEqual([printed(8.4, 2), 'U1', printed(3.15, 2), 'U3']);
    // A's R_x: 0 under U1, −1.5·4 = −6.00 under U2 (first of the two equal ones).
    expect(expected[0]).toEqual([printed(0, 2), 'U1', printed(-6, 2), 'U2']);
    expect(view.bearings.words[0]).toMatch(/^No uplift at A: .* from 3\.15\u202fkN under U3 to 8\.40\u202fkN under U1\.$/);
    expect(view.cover.summary).toContainEqual({ label: 'Uplift', value: 'none at any support' });
  });

  it('when the table lists cases and combinations, then each row holds every support’s Rx and Ry by superposition', () => {
    const view = buildCalcSheetView(sheetInput(triangleModel(['D', 'W'], COMBOS)));
    const [table] = view.bearings.bySource;
    expect(table.head).toEqual(['A', 'B']);
    const row = (name: string, f: { D?: number; W?: number }) => [
      name,
      ...(['A', 'B'] as S[]).flatMap((s) =>
        (['rx', 'ry'] as const).map((k) => printed((f.D ?? 0) * TRIANGLE_REACTIONS.D[s][k] + (f.W ?? 0) * TRIANGLE_REACTIONS.W[s][k], 2)),
      ),
    ];
    expect(table.rows.map((r) => r.cells)).toEqual([row('D', { D: 1 }), row('W', { W: 1 }), ...COMBOS.map((c) => row(c.name, c.factors))]);
    expect(table.rows.map((r) => r.cls)).toEqual(['case', 'case', undefined, undefined, undefined]);
  });

  it('when wind alone lifts the pin and no combinations are given, then the uplift H·h/L is said in words and on the cover', () => {
    const view = buildCalcSheetView(sheetInput(triangleModel(['D', 'W'])));
    const lift = (TRIANGLE.H * TRIANGLE.h) / TRIANGLE.L; // 4·3/8 = 1.5 kN, moments about B
    expect(view.bearings.source).toBe('over the load cases (no combinations were given)');
    expect(view.bearings.extremes[1].cells.slice(5)).toEqual([printed(-lift, 2), 'W']);
    expect(view.bearings.extremes[1].cls).toBe('uplift');
    expect(view.bearings.words[0]).toBe(
      `Uplift at A: under W the support pulls down on the truss with ${printed(lift, 2)}\u202fkN; the bearing must be held down (anchor or hold-down) for it. Largest downward bearing force ${printed(TRIANGLE.P / 2, 2)}\u202fkN under D.`,
    );
    expect(view.cover.summary).toContainEqual({ label: 'Uplift', value: `A: ${printed(lift, 2)}\u202fkN, W` });
  });

  it('when the project is in US units, then the reactions are in kip (1 kip = 4.4482216152605 kN, NIST SP 811)', () => {
    const view = buildCalcSheetView(
      sheetInput(triangleModel(['D']), { project: { name: 'Fenwick depot — canopy', jobNumber: 'OL-0912', unitSystem: 'US' } }),
    );
    expect(view.bearings.extremes[1].cells[3]).toBe(printed(TRIANGLE.P / 2 / KN_PER_KIP, 2));
  });

  it('when the sheet is printed, then the section is in the contents after the envelope and its table is in the HTML', () => {
    const view = buildCalcSheetView(sheetInput(triangleModel(['D', 'W'])));
    const anchors = view.cover.contents.map((c) => c.anchor);
    expect(anchors.indexOf('bearings')).toBe(anchors.indexOf('combinations') + 1);
    const html = renderCalcSheetHtml(view);
    const section = html.slice(html.indexOf('<section class="sheet-section" id="bearings">'));
    expect(section).toContain(`<span class="sec-no">${view.numbers.bearings}</span>Reactions for bearing design`);
    expect(section).toContain('Uplift at A: under W');
    expect(html.indexOf('id="bearings"')).toBeLessThan(html.indexOf('id="residual"'));
  });
});

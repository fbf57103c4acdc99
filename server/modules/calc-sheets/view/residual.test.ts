import { describe, expect, it } from 'vitest';
import { trussSolve } from '@shared/solver';
import { buildCalcSheetView } from './index';
import { printed, sheetInput, TRIANGLE, triangleModel } from './view-fixtures';

describe('sheet view: equilibrium residual', () => {
  it('when both cases balance, then each row gives the largest load (P and H), OK, and the verdict says every case is in equilibrium', () => {
    const view = buildCalcSheetView(sheetInput(triangleModel(['D', 'W'], [{ name: 'U2', factors: { D: 1.2, W: 1.5 }, clause: 'Clause 4.1 (b)' }])));
    expect(view.residual.rows.map((r) => [r.cells[0], r.cells[1], r.cells[5]])).toEqual([
      ['D', printed(TRIANGLE.P, 2), 'OK'],
      ['W', printed(TRIANGLE.H, 2), 'OK'],
    ]);
    expect(view.residual.ok).toBe(true);
    expect(view.residual.verdict).toMatch(/^Every load case is in equilibrium at every joint/);
    expect(view.comboResidualRows.map((r) => r.cells.slice(0, 2))).toEqual([['U2', 'Clause 4.1 (b)']]);
    expect(view.cover.summary.at(-1)?.value).toMatch(/in equilibrium$/);
    expect(view.cover.contents.at(-1)).toEqual({ anchor: 'residual', title: 'Equilibrium residual check' });
  });

  it('when one case is out of balance past 1e-9 of its largest load, then its row reads NOT OK and the verdict says not to use the results', () => {
    const model = triangleModel(['D', 'W']);
    const analysis = trussSolve(model);
    analysis.cases[1] = { ...analysis.cases[1], residual: 1e-6 * TRIANGLE.H };
    const view = buildCalcSheetView(sheetInput(model, { analysis }));
    expect(view.residual.rows.map((r) => r.cells[5])).toEqual(['OK', 'NOT OK']);
    expect(view.residual.ok).toBe(false);
    expect(view.residual.verdict).toBe('At least one load case is NOT in equilibrium: do not use these results.');
    expect(view.cover.summary.at(-1)?.value).toMatch(/NOT in equilibrium$/);
  });
});

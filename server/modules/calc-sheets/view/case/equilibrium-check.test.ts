import { describe, expect, it } from 'vitest';
import { trussSolve } from '@shared/solver';
import { buildCalcSheetView } from '../index';
import { sheetInput, TRIANGLE, triangleModel } from '../view-fixtures';

describe('sheet view: equilibrium check of a case', () => {
  it('when the solution balances every joint, then the check is OK and says every joint is in equilibrium', () => {
    const [d] = buildCalcSheetView(sheetInput(triangleModel())).cases;
    expect(d.check.ok).toBe(true);
    expect(d.check.verdict).toMatch(/every joint is in equilibrium \(limit 1 × 10⁻⁹\)/);
    expect(d.check.lines.every((l) => l.includes('class="katex"'))).toBe(true);
  });

  it('when a case is out of balance by a thousandth of its largest load, then the check fails and says not to use the results', () => {
    const model = triangleModel();
    const analysis = trussSolve(model);
    const c = analysis.cases[0];
    // Largest load of the case: P = 12 kN at C; 1e-3 of it is far past the 1e-9 limit.
    analysis.cases[0] = { ...c, residual: 1e-3 * TRIANGLE.P, check: { ...c.check, residual: 1e-3 * TRIANGLE.P, residualJointTag: 'C' } };
    const [d] = buildCalcSheetView(sheetInput(model, { analysis })).cases;
    expect(d.check.ok).toBe(false);
    expect(d.check.verdict).toMatch(/at joint C exceeds 1 × 10⁻⁹ of the largest load: do not use these results/);
  });

  it('when geometry and loads are mirror-symmetric, then a symmetry note is given; under a side load it is not', () => {
    const [d, w] = buildCalcSheetView(sheetInput(triangleModel(['D', 'W']))).cases;
    expect(d.symmetryNote).toMatch(/mirror-symmetric/);
    expect(w.symmetryNote).toBeUndefined();
  });
});

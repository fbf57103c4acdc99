import { describe, expect, it } from 'vitest';
import { buildCalcSheetView } from '../index';
import { hangerForces, hangerModel, postedTriangleModel, printed, sheetInput, TRIANGLE_FORCES, triangleModel } from '../view-fixtures';

describe('sheet view: member forces', () => {
  it('when the triangle carries P at the apex, then the tie is +P/(2 tan θ) (T) and each rafter −P/(2 sin θ) (C)', () => {
    const [d] = buildCalcSheetView(sheetInput(triangleModel())).cases;
    const f = TRIANGLE_FORCES.D;
    expect(d.forceRows.map((r) => [r.cells[0], r.cells[3], r.cells[4]])).toEqual([
      ['AB', printed(f.AB, 2, true), '(T)'],
      ['AC', printed(f.AC, 2, true), '(C)'],
      ['BC', printed(f.BC, 2, true), '(C)'],
    ]);
    expect(d.forceSvg).toMatch(/^<svg/);
  });

  it('when a member carries nothing, then its row reads 0.00 with sense 0 and the zero class', () => {
    const [c] = buildCalcSheetView(sheetInput(postedTriangleModel())).cases;
    const post = c.forceRows.find((r) => r.cells[0] === 'MC')!;
    expect(post.cells.slice(3)).toEqual([printed(0, 2), '0']);
    expect(post.cls).toBe('zero');
  });

  it('when the three-bar hanger is solved, then the bars match the compatibility closed form P/(1 + 2cos³α) and P·cos²α/(1 + 2cos³α)', () => {
    const [c] = buildCalcSheetView(sheetInput(hangerModel())).cases;
    const f = hangerForces();
    expect(c.forceRows.map((r) => r.cells[3])).toEqual([printed(f.AD, 2, true), printed(f.BD, 2, true), printed(f.CD, 2, true)]);
    expect(c.forceRows.every((r) => r.cells[4] === '(T)')).toBe(true);
  });
});

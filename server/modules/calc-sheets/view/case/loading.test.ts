import { describe, expect, it } from 'vitest';
import { buildCalcSheetView } from '../index';
import { KN_PER_KIP, printed, sheetInput, TRIANGLE, triangleModel } from '../view-fixtures';

describe('sheet view: loads of a case', () => {
  it('when a case has a joint load, then the table gives the joint, Fx and Fy (downward negative) and the drawing is an SVG', () => {
    const [d, w] = buildCalcSheetView(sheetInput(triangleModel(['D', 'W']))).cases;
    expect(d.loadRows.map((r) => r.cells)).toEqual([['C', printed(0, 2), printed(-TRIANGLE.P, 2), '']]);
    expect(w.loadRows.map((r) => r.cells)).toEqual([['C', printed(TRIANGLE.H, 2), printed(0, 2), '']]);
    expect(d.loadingSvg).toMatch(/^<svg/);
  });

  it('when the project is in US units, then the loads print in kip', () => {
    const [d] = buildCalcSheetView(sheetInput(triangleModel(), { project: { name: 'P', jobNumber: 'J', unitSystem: 'US' } })).cases;
    expect(d.loadRows[0].cells[2]).toBe(printed(-TRIANGLE.P / KN_PER_KIP, 2)); // −2.70 kip
  });
});

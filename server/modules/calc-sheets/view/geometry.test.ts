import { describe, expect, it } from 'vitest';
import { buildCalcSheetView } from './index';
import { M_PER_FT, printed, sheetInput, TRIANGLE, triangleModel } from './view-fixtures';

describe('sheet view: geometry', () => {
  it('when the 3-4-5 triangle is built, then joints print their coordinates and each rafter is 5 m long (Pythagoras)', () => {
    const { L, h } = TRIANGLE;
    const { geometry } = buildCalcSheetView(sheetInput(triangleModel()));
    expect(geometry.jointRows.map((r) => r.cells)).toEqual([
      ['A', printed(0, 3), printed(0, 3)],
      ['B', printed(L, 3), printed(0, 3)],
      ['C', printed(L / 2, 3), printed(h, 3)],
    ]);
    const rafter = Math.hypot(L / 2, h);
    expect(geometry.memberRows.map((r) => r.cells.slice(0, 4))).toEqual([
      ['AB', 'A', 'B', printed(L, 3)],
      ['AC', 'A', 'C', printed(rafter, 3)],
      ['BC', 'B', 'C', printed(rafter, 3)],
    ]);
    expect(rafter).toBe(5);
    expect(geometry.svg).toMatch(/^<svg/);
  });

  it('when the project is in US units, then lengths print in feet at 0.3048 m to the foot, two decimals', () => {
    const { geometry } = buildCalcSheetView(sheetInput(triangleModel(), { project: { name: 'P', jobNumber: 'J', unitSystem: 'US' } }));
    expect(geometry.memberRows[1].cells[3]).toBe(printed(5 / M_PER_FT, 2)); // 16.40 ft
    expect(geometry.jointRows[1].cells[1]).toBe(printed(TRIANGLE.L / M_PER_FT, 2)); // 26.25 ft
  });
});

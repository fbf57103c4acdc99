import { describe, expect, it } from 'vitest';
import { buildCalcSheetView } from '../index';
import { postedTriangleModel, sheetInput, triangleModel } from '../view-fixtures';

describe('sheet view: zero-force members', () => {
  it('when an unloaded joint has two collinear members and a third, then the third is listed as zero by rule 2 with the collinear pair', () => {
    const [c] = buildCalcSheetView(sheetInput(postedTriangleModel())).cases;
    expect(c.zeroForce.rows.map((r) => r.cells.slice(0, 2))).toEqual([['MC', 'M']]);
    expect(c.zeroForce.rows[0].cells[2]).toBe('three members meet, AM and MB in line, no load, no support');
    expect(c.zeroForce.steps).toHaveLength(1);
    expect(c.zeroForce.steps[0].lines.every((l) => l.includes('class="katex"'))).toBe(true);
  });

  it('when every joint is loaded or supported, then no member is listed', () => {
    expect(buildCalcSheetView(sheetInput(triangleModel())).cases[0].zeroForce).toEqual({ rows: [], steps: [] });
  });
});

import { describe, expect, it } from 'vitest';
import { buildCalcSheetView } from './index';
import { hangerModel, sheetInput, triangleModel } from './view-fixtures';

describe('sheet view: supports and materials', () => {
  it('when a truss has a pin and a vertical-reaction roller, then the pin restrains x and y (2) and the roller one direction at 90° (1)', () => {
    const { supports } = buildCalcSheetView(sheetInput(triangleModel()));
    expect(supports.rows.map((r) => r.cells)).toEqual([
      ['A', 'Pin', 'x and y', '2'],
      ['B', 'Roller', 'at 90.0° from horizontal', '1'],
    ]);
    expect(supports.materialNote).toMatch(/determinate/);
  });

  it('when a member has E and A, then E prints in GPa, A in mm² and EA = E·A in kN', () => {
    const model = triangleModel();
    // Structural steel, E = 200 GPa (common handbook value, e.g. EN 1993-1-1 §3.2.6); A = 1 200 mm².
    const E = 200e6; // kN/m²
    const A = 1200e-6; // m²
    model.members[0] = { ...model.members[0], material: 'S275', section: 'Angle 80×80×8', E, A };
    const { supports } = buildCalcSheetView(sheetInput(model));
    // 200e6 kN/m² = 200 GPa; 1 200 mm²; EA = 200e6 × 1.2e-3 = 240 000 kN.
    expect(supports.materialRows.map((r) => r.cells)).toEqual([['AB', 'S275', 'Angle 80×80×8', '200.0', '1200', '240000']]);
  });

  it('when the truss is indeterminate, then the note says the forces depend on EA', () => {
    expect(buildCalcSheetView(sheetInput(hangerModel())).supports.materialNote).toMatch(/indeterminate: member forces depend on each member’s axial stiffness EA/);
  });
});

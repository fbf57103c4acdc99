import { describe, expect, it } from 'vitest';
import { buildCalcSheetView } from '../index';
import { hangerModel, katexText, sheetInput, TRIANGLE_FORCES, triangleModel } from '../view-fixtures';

describe('sheet view: joint steps', () => {
  it('when the triangle is solved by the method of joints, then the steps are typeset with a free-body diagram and give the closed-form forces', () => {
    const [d] = buildCalcSheetView(sheetInput(triangleModel())).cases;
    expect(d.jointSteps.length).toBeGreaterThan(0);
    expect(d.stiffnessSteps).toEqual([]);
    for (const s of d.jointSteps) {
      expect(s.lines.every((l) => l.includes('class="katex"'))).toBe(true);
      expect(s.svg).toMatch(/^<svg class="fbd"/);
    }
    // Equations are written to three decimals: the tie +8.000 and the rafters −10.000 (TRIANGLE_FORCES).
    const text = d.jointSteps.map((s) => s.lines.map(katexText).join(' ')).join(' ');
    expect(text).toContain(Math.abs(TRIANGLE_FORCES.D.AB).toFixed(3));
    expect(text).toContain(Math.abs(TRIANGLE_FORCES.D.AC).toFixed(3));
    expect(text).not.toMatch(/\\Sigma|\\mathrm/);
  });

  it('when the truss is indeterminate, then there are stiffness steps and no joint steps', () => {
    const [c] = buildCalcSheetView(sheetInput(hangerModel())).cases;
    expect(c.jointSteps).toEqual([]);
    expect(c.stiffnessSteps.length).toBeGreaterThan(0);
    expect(c.stiffnessSteps.every((s) => s.lines.every((l) => l.includes('class="katex"')) && s.svg === undefined)).toBe(true);
  });
});

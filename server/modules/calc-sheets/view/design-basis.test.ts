import { describe, expect, it } from 'vitest';
import { buildCalcSheetView } from './index';
import { hangerModel, sheetInput, triangleModel } from './view-fixtures';

describe('sheet view: design basis', () => {
  it('when the design basis has paragraphs and the combinations cite clauses, then each paragraph and each clause prints once', () => {
    const model = triangleModel(['D', 'W'], [
      { name: 'U1', factors: { D: 1.4 }, clause: 'Clause 4.1 (a)' },
      { name: 'U2', factors: { D: 1.2, W: 1.5 }, clause: 'Clause 4.1 (b)' },
      { name: 'U3', factors: { D: 0.9, W: 1.5 }, clause: 'Clause 4.1 (b)' },
      { name: 'S1', factors: { D: 1, W: 1 } },
    ]);
    const basis = 'Timber to the local grading rules.\n\n  Roof sheeting 0.25 kPa on plan.  \n \nWind by the site survey.';
    const view = buildCalcSheetView(sheetInput(model, { project: { name: 'P', jobNumber: 'J', unitSystem: 'SI', designBasis: basis } }));
    expect(view.designBasis.paragraphs).toEqual(['Timber to the local grading rules.', 'Roof sheeting 0.25 kPa on plan.', 'Wind by the site survey.']);
    expect(view.designBasis.clauses).toEqual(['Clause 4.1 (a)', 'Clause 4.1 (b)']);
    expect(view.caution).toMatch(/licensed professional engineer/);
  });

  it('when the truss is determinate or indeterminate, then the method line names the method of joints or the direct stiffness method', () => {
    // Triangle: m + r = 3 + 3 = 6 = 2j; hanger: 3 + 6 = 9 > 2j = 8 (count rule of plane trusses).
    const det = buildCalcSheetView(sheetInput(triangleModel())).designBasis.method.join(' ');
    const ind = buildCalcSheetView(sheetInput(hangerModel())).designBasis.method.join(' ');
    expect(det).toMatch(/method of joints/);
    expect(det).not.toMatch(/direct stiffness/);
    expect(ind).toMatch(/direct stiffness method with each member’s EA/);
  });
});

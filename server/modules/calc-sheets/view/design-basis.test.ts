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

describe('sheet view: design basis describes the methods this sheet uses', () => {
  it('when no joint has two or fewer unknowns, then the method says the unknowns are solved together and does not claim joint by joint', async () => {
    const { modelFromSketch } = await import('@shared/solver/test-trusses');
    // Two pins and a three-hinged outline (r = 4): the reactions come with the member forces at
    // the joints; an invented frame.
    const model = modelFromSketch({
      joints: [['A', 0, 0], ['B', 4, 0], ['C', 2, 3], ['E', 6, 3], ['F', 8, 0]],
      members: [['A', 'B'], ['A', 'C'], ['B', 'C'], ['C', 'E'], ['B', 'E'], ['E', 'F']],
      supports: [{ at: 'A', kind: 'pin' }, { at: 'F', kind: 'pin' }],
      cases: [{ id: 'W', loads: [['E', 5, -10]] }],
    });
    const view = buildCalcSheetView(sheetInput(model));
    const method = view.designBasis.method.join(' ');
    const c = view.cases[0];
    expect(c.simultaneousSteps.length).toBeGreaterThan(0);
    expect(method).toMatch(/solved together/);
    expect(method).toMatch(/found with the member forces at the joints/);
    expect(method).not.toMatch(/moments about a support/);
    if (c.jointSteps.length === 0) expect(method).not.toMatch(/joint by joint/);
  });

  it('when a truss is solved joint by joint, then neither the stiffness method nor a simultaneous solve is claimed', () => {
    const method = buildCalcSheetView(sheetInput(triangleModel())).designBasis.method.join(' ');
    expect(method).toMatch(/joint by joint, each joint with at most two unknowns/);
    expect(method).toMatch(/moments about a support/);
    expect(method).not.toMatch(/solved together|direct stiffness/);
  });
});

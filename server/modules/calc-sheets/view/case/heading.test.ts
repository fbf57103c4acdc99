import { describe, expect, it } from 'vitest';
import { buildCalcSheetView } from '../index';
import { hangerModel, sheetInput, triangleModel } from '../view-fixtures';

describe('sheet view: load case heading', () => {
  it('when a case has a name of its own, then the title gives id and name and the anchor is built from the id', () => {
    const [d, w] = buildCalcSheetView(sheetInput(triangleModel(['D', 'W']))).cases;
    expect(d).toMatchObject({ id: 'D', caseId: 'D', anchor: 'case-D', title: 'Load case D — Roofing and framing' });
    expect(w.title).toBe('Load case W — Wind from the west');
  });

  it('when a case id has characters outside letters, digits, - and _, then the anchor replaces them so it stays a valid id', () => {
    const model = triangleModel();
    model.loadCases[0].id = 'D 1/2';
    model.loadCases[0].name = 'D 1/2';
    const [c] = buildCalcSheetView(sheetInput(model)).cases;
    expect(c.anchor).toBe('case-D_1_2');
    expect(c.title).toBe('Load case D 1/2');
  });

  it('when the truss is determinate or indeterminate, then the case names the method of joints or the direct stiffness method', () => {
    expect(buildCalcSheetView(sheetInput(triangleModel())).cases[0].method).toBe('method of joints');
    expect(buildCalcSheetView(sheetInput(hangerModel())).cases[0].method).toBe('direct stiffness method');
  });
});

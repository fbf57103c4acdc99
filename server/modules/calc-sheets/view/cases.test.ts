import { describe, expect, it } from 'vitest';
import { buildCalcSheetView } from './index';
import { openPanelModel, sheetInput, triangleModel } from './view-fixtures';

describe('sheet view: load cases', () => {
  it('when a truss has two load cases, then there is one case view and one contents line per case, in the order of the model', () => {
    const model = triangleModel(['D', 'W']);
    const view = buildCalcSheetView(sheetInput(model));
    expect(view.cases.map((c) => c.caseId)).toEqual(model.loadCases.map((c) => c.id));
    const lines = view.cover.contents.filter((c) => c.anchor.startsWith('case-'));
    expect(lines).toEqual(view.cases.map((c) => ({ anchor: c.anchor, title: `${c.title}: zero-force members, reactions, joints, forces` })));
    expect(view.cover.summary).toContainEqual({ label: 'Load cases', value: String(model.loadCases.length) });
  });

  it('when the truss is unstable, then there are no case views', () => {
    expect(buildCalcSheetView(sheetInput(openPanelModel())).cases).toEqual([]);
  });
});

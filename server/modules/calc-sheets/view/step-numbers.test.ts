import { describe, expect, it } from 'vitest';
import { buildCalcSheetView } from './index';
import { renderCalcSheetHtml } from '../calc-sheet-html';
import { sheetInput, triangleModel } from './view-fixtures';

describe('sheet view: step numbers', () => {
  it('when a sheet with two cases is built, then each step is numbered section.step in reading order and no internal id is printed', () => {
    const view = buildCalcSheetView(sheetInput(triangleModel(['D', 'W'])));
    // The contents numbers the sections 1, 2, …; a case's steps follow its own number.
    for (const c of view.cases) {
      const section = view.numbers[c.anchor];
      expect(section).toMatch(/^\d+$/);
      const steps = [...c.zeroForce.steps, ...c.reactionSteps, ...c.jointSteps, ...c.simultaneousSteps, ...c.stiffnessSteps, c.check];
      expect(steps.map((s) => s.number)).toEqual(steps.map((_, i) => `${section}.${i + 1}`));
    }
    expect(view.stability.number).toBe(`${view.numbers.stability}.1`);
    const html = renderCalcSheetHtml(view);
    const printed = html.replace(/<[^>]+>/g, ' ').replace(/\s+/g, ' ');
    // Ids stay as anchors (id="case-D/joint-C", href) but are never printed as text.
    const joint = view.cases[0].jointSteps[0];
    expect(joint.id).toMatch(/^case-D\//);
    expect(html).toContain(`id="${joint.id}"`);
    expect(printed).not.toMatch(/case-[DW]\/(joint|reaction|check)/);
    expect(printed).toContain(`${joint.number} ${joint.title}`);
  });
});

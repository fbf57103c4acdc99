import { describe, expect, it } from 'vitest';
import { buildCalcSheetView } from './index';
import { renderCalcSheetHtml } from '../calc-sheet-html';
import { sheetInput, triangleModel } from './view-fixtures';

describe('sheet view: revision table', () => {
  it('when the sheet is a run draft (no revisions), then the cover prints no revision table', () => {
    const view = buildCalcSheetView(sheetInput(triangleModel()));
    expect(view.revisionTable.rows).toEqual([]);
    expect(renderCalcSheetHtml(view)).not.toContain('id="revision-table"');
  });

  it('when the sheet is revision B, then the cover lists A and B with dates, status words and one line per kind that changed, and no step number moves', () => {
    const plain = buildCalcSheetView(sheetInput(triangleModel()));
    const input = {
      ...sheetInput(triangleModel()),
      revisionHistory: [
        { revision: 'A', date: '2026-03-02', status: 'returned', lines: ['First revision of this truss.'] },
        { revision: 'B', date: '2026-03-05', status: 'in-check', lines: ['Loads: case D changed at 1 joint (total Fy −5.00 kN).', 'Forces and reactions: forces of 3 members changed.'] },
      ],
    };
    const view = buildCalcSheetView(input);
    expect(view.revisionTable.rows.map((r) => [r.revision, r.date, r.status])).toEqual([
      ['A', '2026-03-02', 'returned'],
      ['B', '2026-03-05', 'in check'],
    ]);
    const html = renderCalcSheetHtml(view);
    expect(html).toContain('id="revision-table"');
    expect(html).toContain('<div class="rev-line">Loads: case D changed at 1 joint (total Fy −5.00 kN).</div>');
    // The table is part of the cover: the contents and every step keep their numbers.
    expect(view.numbers).toEqual(plain.numbers);
    expect(view.cases.flatMap((c) => c.jointSteps.map((s) => s.number))).toEqual(plain.cases.flatMap((c) => c.jointSteps.map((s) => s.number)));
  });
});

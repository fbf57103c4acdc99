import { describe, expect, it } from 'vitest';
import { LOAD_CATEGORY_NAMES } from '@shared/model/truss';
import { buildCalcSheetView } from './index';
import { KN_PER_KIP, printed, sheetInput, TRIANGLE, triangleModel } from './view-fixtures';

describe('sheet view: load cases and combinations', () => {
  it('when a case has loads, then its row gives the name, the category, the count and the total downward load', () => {
    const { loadCases } = buildCalcSheetView(sheetInput(triangleModel(['D', 'W'])));
    expect(loadCases.rows.map((r) => r.cells)).toEqual([
      ['D', 'Roofing and framing', LOAD_CATEGORY_NAMES.dead, '1', `${printed(TRIANGLE.P, 2)}\u202fkN`],
      // A horizontal load has no downward part.
      ['W', 'Wind from the west', LOAD_CATEGORY_NAMES.wind, '1', `${printed(0, 2)}\u202fkN`],
    ]);
  });

  it('when the project is in US units, then the total load prints in kip (1 kip = 4.4482216152605 kN, NIST SP 811)', () => {
    const { loadCases } = buildCalcSheetView(sheetInput(triangleModel(), { project: { name: 'P', jobNumber: 'J', unitSystem: 'US' } }));
    expect(loadCases.rows[0].cells[4]).toBe(`${printed(TRIANGLE.P / KN_PER_KIP, 2)}\u202fkip`);
  });

  it('when combinations are given, then each row names its factors per case and its clause, or a dash', () => {
    const model = triangleModel(['D', 'W'], [
      { name: 'U2', factors: { D: 1.2, W: 1.5 }, clause: 'Clause 4.1 (b)' },
      { name: 'S1', factors: { D: 1, W: 0.75 } },
    ]);
    const { combinations } = buildCalcSheetView(sheetInput(model));
    expect(combinations.rows.map((r) => r.cells)).toEqual([
      ['U2', '1.2\u2009D + 1.5\u2009W', 'Clause 4.1 (b)'],
      ['S1', '1\u2009D + 0.75\u2009W', '—'],
    ]);
  });
});

import { describe, expect, it } from 'vitest';
import { buildCalcSheetView } from './index';
import { printed, sheetInput, TRIANGLE_FORCES, triangleModel } from './view-fixtures';

describe('sheet view: combinations', () => {
  it('when 1.2 D + 1.5 W is combined, then each member reads 1.2·F_D + 1.5·F_W (superposition of the closed forms)', () => {
    const view = buildCalcSheetView(sheetInput(triangleModel(['D', 'W'], [{ name: 'U2', factors: { D: 1.2, W: 1.5 } }])));
    expect(view.comboTables).toHaveLength(1);
    const [table] = view.comboTables;
    expect(table.title).toBe('Combinations');
    expect(table.head).toEqual(['U2']);
    const combined = (m: 'AB' | 'AC' | 'BC') => 1.2 * TRIANGLE_FORCES.D[m] + 1.5 * TRIANGLE_FORCES.W[m];
    expect(table.rows.map((r) => r.cells)).toEqual([
      ['AB', printed(combined('AB'), 2, true)], // +12.60
      ['AC', printed(combined('AC'), 2, true)], // −8.25
      ['BC', printed(combined('BC'), 2, true)], // −15.75
    ]);
    expect(view.cover.contents).toContainEqual({ anchor: 'combinations', title: 'Combinations and envelope' });
    expect(view.cover.summary).toContainEqual({ label: 'Combinations', value: '1' });
  });

  it('when there are eight combinations, then they print in tables of six columns: 1–6 and 7–8 of 8', () => {
    const combos = Array.from({ length: 8 }, (_, i) => ({ name: `K${i + 1}`, factors: { D: 1 + i / 10 } }));
    const view = buildCalcSheetView(sheetInput(triangleModel(['D'], combos)));
    expect(view.comboTables.map((t) => [t.title, t.head.length])).toEqual([
      ['Combinations 1–6 of 8', 6],
      ['Combinations 7–8 of 8', 2],
    ]);
    // The eighth combination is 1.7 D: the tie carries 1.7 × 8 = 13.60 kN.
    expect(view.comboTables[1].rows[0].cells[2]).toBe(printed(1.7 * TRIANGLE_FORCES.D.AB, 2, true));
  });

  it('when no combinations are given, then there is no table and the contents line says Envelope', () => {
    const view = buildCalcSheetView(sheetInput(triangleModel()));
    expect(view.comboTables).toEqual([]);
    expect(view.cover.contents).toContainEqual({ anchor: 'combinations', title: 'Envelope' });
  });
});

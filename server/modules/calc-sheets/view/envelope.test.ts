import { describe, expect, it } from 'vitest';
import type { Combination } from '@shared/model/truss';
import { buildCalcSheetView } from './index';
import { printed, sheetInput, TRIANGLE_FORCES, triangleModel } from './view-fixtures';

const COMBOS: Combination[] = [
  { name: 'U1', factors: { D: 1.4 } },
  { name: 'U2', factors: { D: 1.2, W: 1.5 } },
  { name: 'U3', factors: { D: 0.9, W: 1.5 } },
];
type M = 'AB' | 'AC' | 'BC';
/** Each combination's force in a member by superposition of the closed forms. */
const byCombo = (m: M) => COMBOS.map((c) => ({ name: c.name, f: (c.factors.D ?? 0) * TRIANGLE_FORCES.D[m] + (c.factors.W ?? 0) * TRIANGLE_FORCES.W[m] }));

describe('sheet view: envelope', () => {
  it('when three combinations act on the triangle, then each member shows its largest tension and compression and which combination gives it', () => {
    const view = buildCalcSheetView(sheetInput(triangleModel(['D', 'W'], COMBOS)));
    expect(view.envelope.source).toBe('over the combinations');
    for (const [i, m] of (['AB', 'AC', 'BC'] as M[]).entries()) {
      const all = byCombo(m);
      const t = all.reduce((a, b) => (b.f > a.f ? b : a));
      const c = all.reduce((a, b) => (b.f < a.f ? b : a));
      const cells = view.envelope.rows[i].cells;
      expect(cells[0]).toBe(m);
      expect(cells.slice(1, 3)).toEqual(t.f > 0 ? [printed(t.f, 2, true), t.name] : ['—', '']);
      expect(cells.slice(3, 5)).toEqual(c.f < 0 ? [printed(c.f, 2), c.name] : ['—', '']);
    }
    // The tie is in tension under every combination: largest 1.2·8 + 1.5·2 = 12.60 kN under U2;
    // the leeward rafter BC is most compressed under U2 too: 1.2·(−10) + 1.5·(−2.5) = −15.75 kN.
    expect(view.cover.summary).toContainEqual({ label: 'Largest tension', value: `AB: ${printed(12.6, 2, true)}\u202fkN (T), U2` });
    expect(view.cover.summary).toContainEqual({ label: 'Largest compression', value: `BC: ${printed(-15.75, 2)}\u202fkN (C), U2` });
  });

  it('when no combinations are given, then the envelope is taken over the load cases', () => {
    const view = buildCalcSheetView(sheetInput(triangleModel(['D', 'W'])));
    expect(view.envelope.source).toBe('over the load cases (no combinations were given)');
    // Tie: D gives +8, W gives +2, so the largest tension is 8.00 under D.
    expect(view.envelope.rows[0].cells.slice(1, 3)).toEqual([printed(TRIANGLE_FORCES.D.AB, 2, true), 'D']);
  });
});

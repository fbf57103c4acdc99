import { describe, expect, it } from 'vitest';
import { trussSolve } from './solve';
import { modelFromSketch, parallelChordSketch } from './test-trusses';
import type { TrussAnalysis } from './types';

/** The independent residual must stay within 1e-9 of the largest load (issue requirement). */
function expectBalanced(result: TrussAnalysis, largestLoad: number) {
  for (const c of result.cases) expect(c.residual).toBeLessThanOrEqual(1e-9 * largestLoad);
}

/**
 * Parallel-chord truss with n panels, loads P at the interior bottom panel points.
 * Closed forms by the method of sections (any structural analysis textbook, e.g. Hibbeler,
 * Structural Analysis, ch. 3; formulas re-derived here): R = (n−1)P/2, panel shear
 * V_k = (n−1−2k)P/2, panel-point moment M_k = P·a·k(n−k)/2, chord force = M/h at the joint
 * opposite the cut, diagonal = V·d/h.
 */
describe('parallel-chord trusses against the method of sections', () => {
  const shapes: [number, number, number, number][] = [
    [2, 3, 4, 10],
    [4, 2.5, 1.8, 7],
    [6, 3, 4, 10],
    [8, 1.2, 0.9, 3.3],
    [10, 2, 1.5, 12],
  ];
  for (const web of ['pratt', 'howe'] as const) {
    for (const [n, a, h, P] of shapes) {
      it(`when a ${web} truss of ${n} panels (a=${a} m, h=${h} m) carries ${P} kN at each bottom panel point, then reactions, chords, diagonals and verticals match the closed forms`, () => {
        const result = trussSolve(modelFromSketch(parallelChordSketch(web, n, a, h, P)));
        expect(result.classification.kind).toBe('determinate');
        const c = result.cases[0];
        const f = c.forces;
        const d = Math.hypot(a, h);
        const R = ((n - 1) * P) / 2;
        const V = (k: number) => ((n - 1 - 2 * k) * P) / 2;
        const M = (k: number) => (P * a * k * (n - k)) / 2;
        const pin = c.reactions.find((r) => r.joint === 'L0')!;
        const roller = c.reactions.find((r) => r.joint === `L${n}`)!;
        expect(pin.ry).toBeCloseTo(R, 9);
        expect(pin.rx).toBeCloseTo(0, 9);
        expect(roller.ry).toBeCloseTo(R, 9);
        for (let k = 0; k < n / 2; k++) {
          const mk = n - 1 - k; // mirror panel
          if (web === 'pratt') {
            expect(f[`U${k}L${k + 1}`]).toBeCloseTo((V(k) * d) / h, 9);
            expect(f[`L${mk}U${mk + 1}`]).toBeCloseTo((V(k) * d) / h, 9);
            expect(f[`U${k}U${k + 1}`]).toBeCloseTo(-M(k + 1) / h, 9);
            expect(f[`L${k}L${k + 1}`]).toBeCloseTo(M(k) / h, 9);
          } else {
            expect(f[`L${k}U${k + 1}`]).toBeCloseTo((-V(k) * d) / h, 9);
            expect(f[`U${mk}L${mk + 1}`]).toBeCloseTo((-V(k) * d) / h, 9);
            expect(f[`U${k}U${k + 1}`]).toBeCloseTo(-M(k) / h, 9);
            expect(f[`L${k}L${k + 1}`]).toBeCloseTo(M(k + 1) / h, 9);
          }
          expect(f[`U${mk}U${mk + 1}`]).toBeCloseTo(f[`U${k}U${k + 1}`], 9);
        }
        for (let k = 1; k < n / 2; k++) {
          expect(f[`U${k}L${k}`]).toBeCloseTo(web === 'pratt' ? -V(k) : V(k - 1), 9);
        }
        // Mid-span: the chord cut opposite the centre joint carries M_mid/h = P·a·n²/(8h).
        const mid = (P * a * n * n) / 8 / h;
        if (web === 'pratt') expect(f[`U${n / 2 - 1}U${n / 2}`]).toBeCloseTo(-mid, 9);
        else expect(f[`L${n / 2 - 1}L${n / 2}`]).toBeCloseTo(mid, 9);
        expect(f[`U${n / 2}L${n / 2}`]).toBeCloseTo(web === 'pratt' ? 0 : P, 9);
        expect(f.U0L0).toBeCloseTo(web === 'pratt' ? -R : 0, 9);
        expectBalanced(result, P);
      });
    }
  }
});

describe('king-post truss (hand calculation by the method of joints)', () => {
  // A(0,0) pin, B(8,0) roller, apex C(4,3), D(4,0): rafters 5 m (sin θ = 3/5, cos θ = 4/5).
  const sketch = (at: 'C' | 'D', P: number) =>
    modelFromSketch({
      joints: [['A', 0, 0], ['B', 8, 0], ['C', 4, 3], ['D', 4, 0]],
      members: [['A', 'C'], ['C', 'B'], ['A', 'D'], ['D', 'B'], ['C', 'D']],
      supports: [{ at: 'A', kind: 'pin' }, { at: 'B', kind: 'roller' }],
      cases: [{ id: 'D', loads: [[at, 0, -P]] }],
    });

  it('when 100 kN hangs at the apex, then the rafters carry −(P/2)/sin θ, the tie (P/2)·cot θ and the king post nothing', () => {
    const P = 100;
    const sin = 3 / 5;
    const cos = 4 / 5;
    const r = trussSolve(sketch('C', P));
    const f = r.cases[0].forces;
    expect(f.AC).toBeCloseTo(-(P / 2) / sin, 9); // −5P/6
    expect(f.CB).toBeCloseTo(-(P / 2) / sin, 9);
    expect(f.AD).toBeCloseTo(((P / 2) * cos) / sin, 9); // +2P/3
    expect(f.DB).toBeCloseTo(((P / 2) * cos) / sin, 9);
    expect(f.CD).toBeCloseTo(0, 12);
    expect(r.cases[0].zeroForce.map((z) => [z.member, z.joint, z.rule, z.pass])).toEqual([['CD', 'D', 2, 1]]);
    expectBalanced(r, P);
  });

  it('when the load moves to the tie joint D, then the king post carries it in tension and the rest is unchanged', () => {
    const P = 100;
    const r = trussSolve(sketch('D', P));
    const f = r.cases[0].forces;
    expect(f.CD).toBeCloseTo(P, 9);
    expect(f.AC).toBeCloseTo((-5 * P) / 6, 9);
    expect(f.AD).toBeCloseTo((2 * P) / 3, 9);
    expect(r.cases[0].zeroForce).toEqual([]);
  });

  it('when solved, then reactions come from ΣM about the pin, ΣFx and ΣFy with the loads substituted', () => {
    const r = trussSolve(sketch('C', 100));
    const steps = r.cases[0].reactionSteps;
    expect(steps.map((s) => s.equation.kind)).toEqual(['sum-m', 'sum-fx', 'sum-fy']);
    expect(steps[0].equation.about?.joint).toBe('A');
    // ΣM_A: 8·R_B − 4·100 = 0 (lever arms in m).
    const load = steps[0].equation.terms.find((t) => t.ref.type === 'load')!;
    expect(load.coefficient).toBe(4);
    expect(load.value).toBe(-100);
    expect(steps[0].solves[0].value).toBeCloseTo(50, 12);
    expect(steps[2].solves[0].value).toBeCloseTo(50, 12);
  });
});

/**
 * Pitched roof truss, span 12 m, rise 3 m (slope 1:2), Howe-type web, 10 kN at U1…U5.
 * Expected values by hand: joint L0 (method of joints) and two vertical cuts (method of sections).
 */
describe('pitched Howe roof truss (hand calculation)', () => {
  const P = 10;
  const model = modelFromSketch({
    joints: [
      ['L0', 0, 0], ['L1', 2, 0], ['L2', 4, 0], ['L3', 6, 0], ['L4', 8, 0], ['L5', 10, 0], ['L6', 12, 0],
      ['U1', 2, 1], ['U2', 4, 2], ['U3', 6, 3], ['U4', 8, 2], ['U5', 10, 1],
    ],
    members: [
      ['L0', 'U1'], ['U1', 'U2'], ['U2', 'U3'], ['U3', 'U4'], ['U4', 'U5'], ['U5', 'L6'],
      ['L0', 'L1'], ['L1', 'L2'], ['L2', 'L3'], ['L3', 'L4'], ['L4', 'L5'], ['L5', 'L6'],
      ['U1', 'L1'], ['U2', 'L2'], ['U3', 'L3'], ['U4', 'L4'], ['U5', 'L5'],
      ['U1', 'L2'], ['U2', 'L3'], ['L3', 'U4'], ['L4', 'U5'],
    ],
    supports: [{ at: 'L0', kind: 'pin' }, { at: 'L6', kind: 'roller' }],
    cases: [{ id: 'D', loads: ['U1', 'U2', 'U3', 'U4', 'U5'].map((j) => [j, 0, -P] as [string, number, number]) }],
  });

  it('when five panel loads act on the top chord, then joint L0, the cuts through panels 2–3 and the zero-force verticals agree with hand results', () => {
    const r = trussSolve(model);
    const c = r.cases[0];
    const f = c.forces;
    const R = (5 * P) / 2;
    const sin = 1 / Math.sqrt(5);
    const tan = 1 / 2;
    expect(c.reactions[0].ry).toBeCloseTo(R, 9);
    expect(f.L0U1).toBeCloseTo(-R / sin, 9); // −25√5 kN
    expect(f.L0L1).toBeCloseTo(R / tan, 9); // 50 kN
    // Cut through U2U3, U2L3, L2L3; moments about U2 (4, 2): −25·4 + 10·2 + 2·F_L2L3 = 0.
    expect(f.L2L3).toBeCloseTo((R * 4 - P * 2) / 2, 9);
    // Same cut, moments about L3 (6, 0): −25·6 + 10·4 + 10·2 − 6·F_U2U3/√5 = 0.
    expect(f.U2U3).toBeCloseTo(((-R * 6 + P * 4 + P * 2) * Math.sqrt(5)) / 6, 9);
    expect(f.U1L1).toBeCloseTo(0, 12);
    expect(f.U5L5).toBeCloseTo(0, 12);
    const zf = c.zeroForce.map((z) => `${z.member}@${z.joint}/rule${z.rule}`).sort();
    expect(zf).toEqual(['U1L1@L1/rule2', 'U5L5@L5/rule2']);
    expectBalanced(r, P);
    expect(c.symmetry.loadsSymmetric).toBe(true);
    expect(c.symmetry.maxPairDifference).toBeLessThan(1e-9);
  });
});

describe('method of joints steps', () => {
  it('when every joint step is read, then it has at most two unknowns and its equations hold with the solution substituted', () => {
    const r = trussSolve(modelFromSketch(parallelChordSketch('howe', 8, 2, 1.5, 5)));
    const c = r.cases[0];
    expect(c.method).toBe('joints');
    expect(c.jointSteps.length).toBeGreaterThan(0);
    const ids = new Set<string>();
    for (const st of c.jointSteps) {
      expect(st.unknowns.length).toBeGreaterThan(0);
      expect(st.unknowns.length).toBeLessThanOrEqual(2);
      expect(st.id).toMatch(/^case-D\/joint-[A-Za-z0-9_-]+$/);
      ids.add(st.id);
      const sol = new Map(st.solution.map((s) => [s.symbol, s.value]));
      for (const eq of st.equations) {
        const sum = eq.terms.reduce((acc, t) => acc + t.coefficient * (t.value ?? (sol.get(t.symbol) as number)), 0);
        expect(Math.abs(sum)).toBeLessThan(1e-9);
      }
      for (const s of st.solution) {
        if (s.ref.type === 'member') expect(s.sense).toBe(Math.abs(s.value) < 1e-9 ? '0' : s.value > 0 ? 'T' : 'C');
      }
    }
    expect(ids.size).toBe(c.jointSteps.length);
  });
});

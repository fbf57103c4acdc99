import { describe, expect, it } from 'vitest';
import { modelPrepare } from '@shared/solver/prepare';
import { trussSolve } from '@shared/solver/solve';
import { stiffnessSolve } from '@shared/solver/stiffness';
import { modelFromSketch, parallelChordSketch, type TrussSketch } from '@shared/solver/test-trusses';
import type { StiffnessDisplacementsStep } from '@shared/solver/types';
import { deflectionCheck } from './deflection';
import { DesignError } from './errors';

const kingPost: TrussSketch = {
  joints: [['A', 0, 0], ['B', 8, 0], ['C', 4, 3], ['D', 4, 0]],
  members: [['A', 'C'], ['C', 'B'], ['A', 'D'], ['D', 'B'], ['C', 'D']],
  supports: [{ at: 'A', kind: 'pin' }, { at: 'B', kind: 'roller' }],
  cases: [{ id: 'P', loads: [['C', 0, -100]] }],
};

/** Joint displacements (mm) of the same truss by the direct stiffness method, EA = A·E. */
function stiffnessDisplacements(sk: TrussSketch, A: number, E: number): Map<string, { ux: number; uy: number }> {
  const model = modelFromSketch({ ...sk, EA: (A * 1e-6) * (E * 1e3) });
  const pm = modelPrepare(model);
  const st = stiffnessSolve(pm, pm.cases[0], 1);
  const d = st.steps.find((s) => s.kind === 'stiffness-displacements') as StiffnessDisplacementsStep;
  return new Map(d.displacements.map((r) => [r.joint, { ux: r.ux * 1000, uy: r.uy * 1000 }]));
}

describe('unit-load (virtual work) deflection δ = Σ n·N·L/(A·E)', () => {
  it('king-post truss, 100 kN at the apex, A = 1000 mm², E = 200 000 MPa: δC = 21/4 mm down (virtual work by hand: 2 × 1.736111 + 2 × 0.888889)', () => {
    const model = modelFromSketch(kingPost);
    const res = deflectionCheck(model, trussSolve(model), { joints: ['C', 'D'], combinations: ['P'], limit: 240 }, () => ({ A: 1000, E: 200_000 }));
    const c = res.find((r) => r.joint === 'C')!;
    expect(c.dy).toBeCloseTo(-5.25, 9);
    expect(c.tableY.find((r) => r.member === 'AC')!.n).toBeCloseTo(5 / 6, 9); // unit load up: rafters in tension
    expect(c.tableY.find((r) => r.member === 'AC')!.term).toBeCloseTo(-1.736111, 6);
    expect(c.tableY.find((r) => r.member === 'AD')!.term).toBeCloseTo(-0.888889, 6);
    // D moves as C: the king post carries no force, so it does not stretch.
    expect(res.find((r) => r.joint === 'D')!.dy).toBeCloseTo(-5.25, 9);
    expect(c.span).toBe(8000);
    expect(c.allowed).toBeCloseTo(8000 / 240, 12);
    expect(c.ratio).toBeCloseTo(5.25 / (8000 / 240), 12);
    expect(c.pass).toBe(true);
  });

  it('king-post truss: the same numbers as the direct stiffness solve of the truss', () => {
    const model = modelFromSketch(kingPost);
    const res = deflectionCheck(model, trussSolve(model), { joints: ['B', 'C', 'D'], combinations: ['P'], limit: 360 }, () => ({ A: 1000, E: 200_000 }));
    const ds = stiffnessDisplacements(kingPost, 1000, 200_000);
    for (const r of res) {
      expect(r.dx).toBeCloseTo(ds.get(r.joint)!.ux, 9);
      expect(r.dy).toBeCloseTo(ds.get(r.joint)!.uy, 9);
    }
    expect(res.find((r) => r.joint === 'B')!.dx).toBeCloseTo(8 / 3, 9); // tie elongation 66.667 kN × 8 m / (AE)
  });

  it('6-panel Pratt, a = 3 m, h = 4 m, 10 kN at L1…L5, A = 2000 mm²: δL3 = 891/320 mm down, 0.365625 mm sideways (virtual work by hand)', () => {
    const sk = parallelChordSketch('pratt', 6, 3, 4, 10);
    const model = modelFromSketch(sk);
    const res = deflectionCheck(model, trussSolve(model), { joints: ['L3'], combinations: ['D'], limit: 240 }, () => ({ A: 2000, E: 200_000 }));
    expect(res[0].dy).toBeCloseTo(-891 / 320, 9);
    expect(res[0].dx).toBeCloseTo(0.365625, 9);
  });

  it('6-panel Pratt: every joint agrees with the direct stiffness displacements', () => {
    const sk = parallelChordSketch('pratt', 6, 3, 4, 10);
    const model = modelFromSketch(sk);
    const joints = model.joints.map((j) => j.id);
    const res = deflectionCheck(model, trussSolve(model), { joints, combinations: ['D'], limit: 240 }, () => ({ A: 2000, E: 200_000 }));
    const ds = stiffnessDisplacements(sk, 2000, 200_000);
    for (const r of res) {
      expect(Math.abs(r.dx - ds.get(r.joint)!.ux)).toBeLessThan(1e-9);
      expect(Math.abs(r.dy - ds.get(r.joint)!.uy)).toBeLessThan(1e-9);
    }
  });

  it('a combination by superposition: 1.0P + 0.5P is 1.5 × 5.25 mm', () => {
    const model = modelFromSketch({ ...kingPost, combinations: [{ name: 'S1', factors: { P: 1.5 } }] });
    const res = deflectionCheck(model, trussSolve(model), { joints: ['C'], combinations: ['S1'], limit: 240 }, () => ({ A: 1000, E: 200_000 }));
    expect(res[0].dy).toBeCloseTo(-7.875, 9);
  });

  it('bad requests: unknown combination, unknown joint, non-positive limit, member without A and E', () => {
    const model = modelFromSketch(kingPost);
    const an = trussSolve(model);
    const p = () => ({ A: 1000, E: 200_000 });
    expect(() => deflectionCheck(model, an, { joints: ['C'], combinations: ['S9'], limit: 240 }, p)).toThrow(/"S9" is neither a combination nor a load case/);
    expect(() => deflectionCheck(model, an, { joints: ['Z'], combinations: ['P'], limit: 240 }, p)).toThrow(/joint Z is not in the truss/);
    expect(() => deflectionCheck(model, an, { joints: ['C'], combinations: ['P'], limit: 0 }, p)).toThrow(DesignError);
    expect(() => deflectionCheck(model, an, { joints: ['C'], combinations: ['P'], limit: 240 }, (id) => (id === 'CD' ? null : p()))).toThrow(/Member CD has no area and modulus/);
  });
});

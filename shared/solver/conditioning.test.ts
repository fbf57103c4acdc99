import { eigs } from 'mathjs';
import { describe, expect, it } from 'vitest';
import { equilibriumRows } from './classify';
import { NEAR_MECHANISM_AMPLIFICATION } from './conditioning';
import { modelPrepare } from './prepare';
import { trussSolve } from './solve';
import { modelFromSketch, parallelChordSketch, type TrussSketch } from './test-trusses';

/**
 * Singular values of the joint-equilibrium matrix A by a general-purpose library: mathjs `eigs`
 * on the dense A·Aᵀ (σ = √λ), a check independent of the banded iteration in conditioning.ts.
 */
function librarySingularValues(sketch: TrussSketch): { min: number; max: number } {
  const pm = modelPrepare(modelFromSketch(sketch));
  const rows = equilibriumRows(pm);
  const cols = pm.members.length + pm.reactions.length;
  const A = rows.map((r) => {
    const dense = new Array<number>(cols).fill(0);
    r.cols.forEach((c, k) => {
      dense[c] += r.vals[k];
    });
    return dense;
  });
  const AAt = A.map((ri) => A.map((rj) => ri.reduce((s, v, k) => s + v * rj[k], 0)));
  const values = (eigs(AAt).values as number[]).map(Number).sort((a, b) => a - b);
  return { min: Math.sqrt(values[0]), max: Math.sqrt(values[values.length - 1]) };
}

/** Two chords of 3 m between two pins, the middle joint `rise` above the line of the pins. */
function toggle(rise: number): TrussSketch {
  return {
    joints: [['A', 0, 0], ['B', 3, rise], ['C', 6, 0]],
    members: [['A', 'B'], ['B', 'C']],
    supports: [{ at: 'A', kind: 'pin' }, { at: 'C', kind: 'pin' }],
    cases: [{ id: 'D', loads: [['B', 0, -1]] }],
  };
}

describe('near a mechanism', () => {
  it('when a toggle is 1 mm from flat, then 1 kN gives P/(2 sin θ) ≈ 1 500 kN in each chord and the truss is flagged near a mechanism at the middle joint', () => {
    const r = trussSolve(modelFromSketch(toggle(0.001)));
    // Statics of the middle joint: 2 N sin θ = P, θ from the 1 mm rise over the 3 m half span.
    const theta = Math.atan2(0.001, 3);
    const expected = -1 / (2 * Math.sin(theta));
    expect(expected).toBeCloseTo(-1500, 0);
    expect(r.cases[0].forces.AB).toBeCloseTo(expected, 6);
    expect(r.cases[0].forces.BC).toBeCloseTo(expected, 6);
    const c = r.classification.conditioning!;
    expect(c.nearMechanism).toBe(true);
    expect(c.jointTags[0]).toBe('B');
    expect(c.jointTags).not.toContain('A');
    const lib = librarySingularValues(toggle(0.001));
    expect(c.sigmaMin!).toBeCloseTo(lib.min, 9);
    expect(Math.abs(c.sigmaMax! - lib.max) / lib.max).toBeLessThan(1e-9);
    expect(c.amplification!).toBeGreaterThan(NEAR_MECHANISM_AMPLIFICATION);
    // The bound ‖[N; R]‖ ≤ ‖F‖/σmin holds for the load of the test, and is nearly reached by it (F lies along the weak mode).
    const N = Object.values(r.cases[0].forces);
    const R = r.cases[0].reactions.flatMap((s) => s.components.map((x) => x.value));
    const rss = Math.hypot(...N, ...R);
    expect(rss).toBeLessThanOrEqual(c.amplification! * 1 * (1 + 1e-12));
    expect(rss).toBeGreaterThan(0.99 * c.amplification!);
    expect(c.message).toMatch(/^Near a mechanism/);
    expect(c.message).toMatch(/joints that move most in that near-mechanism are B:/);
  });

  it('when the toggle rises 1 m, then it is well away from a mechanism and the message says so without a warning', () => {
    const r = trussSolve(modelFromSketch(toggle(1)));
    const c = r.classification.conditioning!;
    expect(c.nearMechanism).toBe(false);
    expect(c.sigmaMin!).toBeCloseTo(librarySingularValues(toggle(1)).min, 9);
    expect(c.message).toMatch(/^Well away from a mechanism/);
  });

  it('when a Pratt truss of 10 panels at span/depth 10 is solved, then its σmin agrees with the library and it is not flagged', () => {
    const s = parallelChordSketch('pratt', 10, 2, 2, 10);
    const c = trussSolve(modelFromSketch(s)).classification.conditioning!;
    const lib = librarySingularValues(s);
    expect(Math.abs(c.sigmaMin! - lib.min) / lib.min).toBeLessThan(1e-8);
    expect(Math.abs(c.sigmaMax! - lib.max) / lib.max).toBeLessThan(1e-8);
    expect(c.ratio!).toBeCloseTo(lib.min / lib.max, 10);
    expect(c.nearMechanism).toBe(false);
  });
});

// Rigid-body statics (from memory, any statics text): a rigid plane body is held by three
// reaction lines that are neither all parallel nor all through one point; a plane truss of j
// joints needs m + r ≥ 2j, and a four-sided panel without a diagonal can shear.
const king: TrussSketch = {
  joints: [['A', 0, 0], ['B', 8, 0], ['C', 4, 3], ['D', 4, 0]],
  members: [['A', 'C'], ['C', 'B'], ['A', 'D'], ['D', 'B'], ['C', 'D']],
  supports: [{ at: 'A', kind: 'pin' }, { at: 'B', kind: 'roller' }],
  cases: [{ id: 'D', loads: [['C', 0, -100]] }],
};

describe('the cause of an unstable truss', () => {
  it('when three rollers all have vertical reaction lines, then the cause is the supports and the advice is to change a support, not to add a member', () => {
    const c = trussSolve(modelFromSketch({ ...king, supports: [{ at: 'A', kind: 'roller' }, { at: 'B', kind: 'roller' }, { at: 'D', kind: 'roller' }] })).classification;
    expect(c.kind).toBe('unstable');
    expect(c.cause?.kind).toBe('supports');
    expect(c.cause?.reason).toMatch(/parallel/);
    expect(c.cause?.diagonal).toBeUndefined();
    expect(c.message).toMatch(/Change a support/);
    expect(c.message).not.toMatch(/missing diagonal|open panel/);
  });

  it('when the roller of a king-post truss has its reaction line through the pin, then the cause is concurrent reactions and the advice is to change a support', () => {
    const c = trussSolve(modelFromSketch({ ...king, supports: [{ at: 'A', kind: 'pin' }, { at: 'B', kind: 'roller', angleDeg: 0 }] })).classification;
    expect(c.cause?.kind).toBe('supports');
    expect(c.cause?.reason).toMatch(/pass through one point \(0\.000, 0\.000\)/);
    expect(c.message).toMatch(/Change a support/);
  });

  it('when a Pratt panel has no diagonal, then the cause is a missing member, the open panel is named, and the named diagonal makes it stable', () => {
    const s = parallelChordSketch('pratt', 4, 3, 2, 10);
    s.members = s.members.filter(([a, b]) => !(a === 'U1' && b === 'L2'));
    const c = trussSolve(modelFromSketch(s)).classification;
    expect(c.kind).toBe('unstable');
    expect(c.cause?.kind).toBe('members');
    const d = c.cause!.diagonal!;
    expect([...d.panel].sort()).toEqual(['L1', 'L2', 'U1', 'U2']);
    expect([[d.fromTag, d.toTag].sort().join('-')]).toEqual(expect.arrayContaining([expect.stringMatching(/^(L2-U1|L1-U2)$/)]));
    expect(d.makesStable).toBe(true);
    expect(c.message).toMatch(new RegExp(`The open panel ${d.panel.join('–')} has no diagonal: a member from ${d.fromTag} to ${d.toTag} makes the truss stable`));
    // Independent check: with that member added the solver calls the truss stable and determinate.
    const fixed = trussSolve(modelFromSketch({ ...s, members: [...s.members, [d.from, d.to]] })).classification;
    expect(fixed.kind).toBe('determinate');
  });

  it('when a panel has no diagonal and the reactions are parallel too, then both causes are named', () => {
    const s = parallelChordSketch('pratt', 4, 3, 2, 10);
    s.members = s.members.filter(([a, b]) => !(a === 'U1' && b === 'L2'));
    s.supports = [{ at: 'L0', kind: 'roller' }, { at: 'L4', kind: 'roller' }, { at: 'L2', kind: 'roller' }];
    const c = trussSolve(modelFromSketch(s)).classification;
    expect(c.cause?.kind).toBe('supports-and-members');
    expect(c.message).toMatch(/parallel/);
    expect(c.message).toMatch(/Besides changing the supports, add a member/);
  });

  it('when a stable truss is solved, then it has no cause', () => {
    expect(trussSolve(modelFromSketch(king)).classification.cause).toBeNull();
  });
});

import { describe, expect, it } from 'vitest';
import { trussSolve } from '@shared/solver/solve';
import { modelFromSketch, parallelChordSketch, type TrussSketch } from '@shared/solver/test-trusses';
import { deflectedShapes, shapeScale, SHAPE_JOINT_LIMIT } from './deflected-shape';
import { deflectionCheck } from './deflection';

// King-post truss (invented): A (0,0) pin, B (8,0) roller, apex C (4,3), D (4,0); 100 kN down at C.
const kingPost: TrussSketch = {
  joints: [['A', 0, 0], ['B', 8, 0], ['C', 4, 3], ['D', 4, 0]],
  members: [['A', 'C'], ['C', 'B'], ['A', 'D'], ['D', 'B'], ['C', 'D']],
  supports: [{ at: 'A', kind: 'pin' }, { at: 'B', kind: 'roller' }],
  cases: [{ id: 'P', loads: [['C', 0, -100]] }],
  combinations: [{ name: 'S1', factors: { P: 1.0 } }, { name: 'S2', factors: { P: 0.5 } }],
};
const props = () => ({ A: 1000, E: 200_000 });

describe('deflected shape by the direct stiffness method, EA = A·E', () => {
  it('king-post: C and D drop 21/4 mm (virtual work by hand), the roller slides by the ties’ stretch', () => {
    const model = modelFromSketch(kingPost);
    const shapes = deflectedShapes(model, trussSolve(model), ['S1', 'S2'], props)!;
    const at = (i: number, tag: string) => shapes[i].joints.find((j) => j.tag === tag)!;
    expect(at(0, 'C').uy).toBeCloseTo(-5.25, 9);
    expect(at(0, 'D').uy).toBeCloseTo(-5.25, 9);
    // Ties carry 2P/3 = 66.667 kN over 4 m: each stretches N·L/(A·E) = 66 667 × 4000 / (1000 × 200 000) = 4/3 mm (closed form).
    expect(at(0, 'D').ux).toBeCloseTo(4 / 3, 9);
    expect(at(0, 'B').ux).toBeCloseTo(8 / 3, 9);
    expect(at(0, 'A').ux).toBe(0);
    // Linear: half the load, half the movement.
    expect(at(1, 'C').uy).toBeCloseTo(-5.25 / 2, 9);
    // By symmetry C slides as D does (half the roller's 8/3 mm): C and D tie for the largest movement.
    expect(at(0, 'C').ux).toBeCloseTo(4 / 3, 9);
    expect(['C', 'D']).toContain(shapes[0].maxTag);
    expect(shapes[0].maxMm).toBeCloseTo(Math.hypot(5.25, 4 / 3), 9);
  });

  it('agrees with the unit-load method at every bottom joint of a Pratt truss (two independent methods)', () => {
    const model = modelFromSketch(parallelChordSketch('pratt', 8, 2, 2.5, 10));
    const analysis = trussSolve(model);
    const bottom = model.joints.filter((j) => j.y === 0).map((j) => j.id);
    const unit = deflectionCheck(model, analysis, { joints: bottom, combinations: [model.loadCases[0].id], limit: 240 }, props);
    const [shape] = deflectedShapes(model, analysis, [model.loadCases[0].id], props)!;
    for (const u of unit) {
      const s = shape.joints.find((j) => j.joint === u.joint)!;
      expect(s.uy).toBeCloseTo(u.dy, 9);
      expect(s.ux).toBeCloseTo(u.dx, 9);
    }
  });

  it('is not worked out past the joint limit, nor for a member without a section', () => {
    const big = modelFromSketch(parallelChordSketch('pratt', SHAPE_JOINT_LIMIT, 2, 1, 1));
    expect(deflectedShapes(big, trussSolve(big), [big.loadCases[0].id], props)).toBeNull();
    const model = modelFromSketch(kingPost);
    expect(deflectedShapes(model, trussSolve(model), ['S1'], (id) => (id === model.members[0].id ? null : props()))).toBeNull();
  });
});

describe('drawing exaggeration (common practice, no source)', () => {
  it('rounds down to 1, 2 or 5 × 10ⁿ so the largest movement is drawn at no more than 6 % of the span', () => {
    expect(shapeScale(8000, 5.25)).toBe(50); // raw 91.4
    expect(shapeScale(12_000, 2)).toBe(200); // raw 360
    expect(shapeScale(10_000, 0.3)).toBe(2000); // raw 2000 exactly
    expect(shapeScale(10_000, 1000)).toBe(1); // already large: drawn true to size
    expect(shapeScale(10_000, 0)).toBe(1);
    for (const [span, max] of [[8000, 5.25], [12_000, 2], [9000, 0.07]]) {
      const s = shapeScale(span, max);
      expect(s * max).toBeLessThanOrEqual(0.06 * span + 1e-9);
      expect(s * max).toBeGreaterThan(0.06 * span * 0.2 - 1e-9);
    }
  });
});

import { describe, expect, it } from 'vitest';
import { trussSolve } from './solve';
import { modelFromSketch, parallelChordSketch, type TrussSketch } from './test-trusses';

// Rules of the count m + r vs 2j and of geometric instability: textbook general method
// (e.g. Hibbeler, Structural Analysis, chapter on trusses; chapter from memory).
const king: TrussSketch = {
  joints: [['A', 0, 0], ['B', 8, 0], ['C', 4, 3], ['D', 4, 0]],
  members: [['A', 'C'], ['C', 'B'], ['A', 'D'], ['D', 'B'], ['C', 'D']],
  supports: [{ at: 'A', kind: 'pin' }, { at: 'B', kind: 'roller' }],
  cases: [{ id: 'D', loads: [['C', 0, -100]] }],
};

describe('stability and determinacy', () => {
  it('when a king-post truss has a pin and a roller, then m + r = 2j with full rank: determinate', () => {
    const c = trussSolve(modelFromSketch(king)).classification;
    expect([c.kind, c.m, c.r, c.j, c.degree, c.rank]).toEqual(['determinate', 5, 3, 4, 0, 8]);
  });

  it('when all three reactions are vertical rollers, then the count passes but the truss is unstable with parallel reactions and no forces are given', () => {
    const r = trussSolve(
      modelFromSketch({ ...king, supports: [{ at: 'A', kind: 'roller' }, { at: 'B', kind: 'roller' }, { at: 'D', kind: 'roller' }] }),
    );
    expect(r.classification.degree).toBe(0);
    expect(r.classification.kind).toBe('unstable');
    expect(r.classification.rank).toBe(7);
    expect(r.classification.message).toMatch(/parallel/);
    // The king-post members alone are rigid (m = 5 = 2j − 3): the advice is to change a support, not to add a diagonal.
    expect(r.classification.message).toMatch(/The members themselves form one rigid truss: the supports are the cause\. Change a support/);
    expect(r.classification.message).not.toMatch(/missing diagonal/);
    expect(r.cases).toEqual([]);
    expect(r.classification.mechanismJoints.sort()).toEqual(['A', 'B', 'C', 'D']);
  });

  it('when the roller reaction line passes through the pin, then the truss is unstable and the message says the lines meet at one point', () => {
    const r = trussSolve(modelFromSketch({ ...king, supports: [{ at: 'A', kind: 'pin' }, { at: 'B', kind: 'roller', angleDeg: 0 }] }));
    expect(r.classification.kind).toBe('unstable');
    expect(r.classification.message).toMatch(/one point \(0\.000, 0\.000\)/);
    expect(r.classification.message).toMatch(/Change a support/);
    expect(r.classification.message).not.toMatch(/missing diagonal/);
    expect(r.classification.mechanismJoints).not.toContain('A');
  });

  it('when a panel of a Pratt truss has no diagonal, then m + r < 2j and the open panel joints are named', () => {
    const s = parallelChordSketch('pratt', 4, 3, 2, 10);
    s.members = s.members.filter(([a, b]) => !(a === 'U1' && b === 'L2'));
    const c = trussSolve(modelFromSketch(s)).classification;
    expect(c.kind).toBe('unstable');
    expect(c.degree).toBe(-1);
    expect(c.message).toMatch(/short of 1 member/);
    // Pin and roller are adequate here; the open panel is the cause, so the advice is a member.
    expect(c.message).toMatch(/Add a member \(such as the missing diagonal of an open panel\)/);
    expect(c.message).not.toMatch(/Change a support/);
    for (const j of ['U1', 'L2', 'U2']) expect(c.mechanismJoints).toContain(j);
    expect(c.mechanismJoints).not.toContain('L0');
  });

  it('when a panel has no diagonal and every reaction is a vertical roller, then the advice names both causes: the supports and a missing member', () => {
    const s = parallelChordSketch('pratt', 4, 3, 2, 10);
    s.members = s.members.filter(([a, b]) => !(a === 'U1' && b === 'L2'));
    s.supports = [{ at: 'L0', kind: 'roller' }, { at: 'L4', kind: 'roller' }, { at: 'L2', kind: 'roller' }];
    const c = trussSolve(modelFromSketch(s)).classification;
    expect(c.kind).toBe('unstable');
    expect(c.message).toMatch(/parallel/);
    expect(c.message).toMatch(/Besides changing the supports, add a member \(such as the missing diagonal of an open panel\)/);
    expect(c.message).not.toMatch(/rigid truss/);
  });

  it('when the diagonal of one panel is moved to cross-brace another, then the count still passes but the rank shows the open panel', () => {
    const s = parallelChordSketch('pratt', 4, 3, 2, 10);
    s.members = s.members.filter(([a, b]) => !(a === 'U1' && b === 'L2'));
    s.members.push(['L0', 'U1']); // second diagonal in panel 0
    const c = trussSolve(modelFromSketch(s)).classification;
    expect(c.degree).toBe(0);
    expect(c.kind).toBe('unstable');
    expect(c.rank).toBe(2 * c.j - 1);
    expect(c.message).toMatch(/geometrically unstable/);
    for (const j of ['U1', 'L2', 'U2']) expect(c.mechanismJoints).toContain(j);
  });

  it('when a joint hangs on a single member, then only that joint is named as the mechanism', () => {
    const s: TrussSketch = { ...king, joints: [...king.joints, ['E', 6, 4]], members: [...king.members, ['C', 'E']] };
    const c = trussSolve(modelFromSketch(s)).classification;
    expect(c.kind).toBe('unstable');
    expect(c.mechanismJoints).toEqual(['E']);
    expect(c.message).toMatch(/Joint E has fewer than two members/);
  });

  it('when two pins hold a king-post truss, then it is indeterminate to degree 1 (external redundant)', () => {
    const c = trussSolve(modelFromSketch({ ...king, supports: [{ at: 'A', kind: 'pin' }, { at: 'B', kind: 'pin' }], EA: 1e5 })).classification;
    expect([c.kind, c.degree]).toEqual(['indeterminate', 1]);
  });
});

import { describe, expect, it } from 'vitest';
import { modelFromSketch, type TrussSketch } from '../solver/test-trusses';
import { trussSolve } from '../solver';
import type { TrussModel } from '../model/truss';
import { forceDiffers, revisionDiff, revisionDiffLines, type ComparedAnalysis, type RevisionSide } from './revision-diff';
import { stepsDiff } from './step-diff';

/**
 * Triangle A(0,0) – B(4,0) – C(2,h), pin at A, roller at B, P kN down at C. Method of joints,
 * worked by hand (from memory, any statics text): R_A,y = R_B,y = P/2; at C,
 * F_AC = F_BC = −(P/2)/sin θ with tan θ = h/2; at A, F_AB = −F_AC·cos θ = (P/2)·2/h.
 */
const triangle = (P: number, h = 2, extra: Partial<TrussSketch> = {}): TrussSketch => ({
  joints: [
    ['A', 0, 0],
    ['B', 4, 0],
    ['C', 2, h],
  ],
  members: [
    ['A', 'B'],
    ['A', 'C'],
    ['B', 'C'],
  ],
  supports: [{ at: 'A', kind: 'pin' }, { at: 'B', kind: 'roller' }],
  cases: [{ id: 'D', loads: [['C', 0, -P]] }],
  ...extra,
});

const side = (sketch: TrussSketch): RevisionSide => {
  const model = modelFromSketch(sketch);
  return { model, analysis: trussSolve(model) };
};

describe('revisionDiff (hand-worked cases)', () => {
  it('a changed load: P 10 → 15 kN at C changes the forces by those of ΔP = 5 kN (superposition)', () => {
    const diff = revisionDiff(side(triangle(10)), side(triangle(15)));
    expect(diff.geometry.jointsMoved).toEqual([]);
    expect(diff.loadCases.changed).toHaveLength(1);
    const d = diff.loadCases.changed[0]!;
    expect(d.id).toBe('D');
    expect(d.loads).toEqual([{ joint: 'C', before: { fx: 0, fy: -10 }, after: { fx: 0, fy: -15 }, dfx: 0, dfy: -5 }]);
    expect(d.dTotalFy).toBe(-5);
    const r = diff.results.find((x) => x.kind === 'case' && x.name === 'D')!;
    expect(r.presence).toBe('both');
    const f = Object.fromEntries(r.forces.map((x) => [x.at, x]));
    // ΔP = 5: ΔF_AB = 5/2 · 2/2 = +2.5 kN; ΔF_AC = ΔF_BC = −2.5/sin 45° = −3.5355 kN.
    expect(f.AB!.before).toBeCloseTo(5, 9);
    expect(f.AB!.after).toBeCloseTo(7.5, 9);
    expect(f.AB!.difference).toBeCloseTo(2.5, 9);
    expect(f.AC!.difference).toBeCloseTo(-2.5 * Math.SQRT2, 9);
    expect(f.BC!.difference).toBeCloseTo(-2.5 * Math.SQRT2, 9);
    // ΔR_y = ΔP/2 = 2.5 kN at A and at B; R_A,x stays 0 (no change, so no row).
    expect(r.reactions.map((x) => [x.at, x.component, Number(x.difference!.toFixed(9))])).toEqual([
      ['A', 'ry', 2.5],
      ['B', 'ry', 2.5],
    ]);
    expect(r.largestForceDifference).toBeCloseTo(2.5 * Math.SQRT2, 9);
    const lines = Object.fromEntries(revisionDiffLines(diff).map((l) => [l.kind, l.text]));
    expect(lines.loads).toBe('case D changed at 1 joint (total Fy \u22125.00\u202fkN)');
    expect(lines.geometry).toBe('no change');
    expect(lines.results).toBe('forces of 3 members changed, by up to 3.54\u202fkN (case D); reactions changed');
    // A US project's lines in kip: 5 kN / 4.4482 kN per kip (1 lbf = 4.4482216152605 N, NIST SP 811) = 1.12 kip; 3.5355 kN = 0.79 kip.
    const us = Object.fromEntries(revisionDiffLines(diff, 'us').map((l) => [l.kind, l.text]));
    expect(us.loads).toBe('case D changed at 1 joint (total Fy \u22121.12\u202fkip)');
    expect(us.results).toBe('forces of 3 members changed, by up to 0.79\u202fkip (case D); reactions changed');
  });

  it('a moved joint: C from (2, 2) to (2, 3) m; reactions stay P/2, the forces follow θ', () => {
    const diff = revisionDiff(side(triangle(10)), side(triangle(10, 3)));
    expect(diff.geometry.jointsMoved).toEqual([{ tag: 'C', before: { x: 2, y: 2 }, after: { x: 2, y: 3 }, dx: 0, dy: 1 }]);
    expect(diff.loadCases.changed).toEqual([]);
    const r = diff.results[0]!;
    const f = Object.fromEntries(r.forces.map((x) => [x.at, x.difference!]));
    // Before: F_AB = 5, F_AC = −5√2. After (tan θ = 3/2): F_AB = 5·2/3 = 3.3333, F_AC = −5·√13/3 = −6.0093.
    expect(f.AB).toBeCloseTo(10 / 3 - 5, 9);
    expect(f.AC).toBeCloseTo((-5 * Math.sqrt(13)) / 3 + 5 * Math.SQRT2, 9);
    expect(r.reactions).toEqual([]);
    expect(revisionDiffLines(diff)[0]!.text).toBe('joint C moved');
  });

  it('a new load case: W with 2 kN to the right at C is new, its results have no earlier values', () => {
    const b = triangle(10);
    b.cases = [...b.cases!, { id: 'W', loads: [['C', 2, 0]] }];
    const diff = revisionDiff(side(triangle(10)), side(b));
    expect(diff.loadCases.added).toEqual([{ id: 'W', name: 'W', category: 'other', loadCount: 1, totalFx: 2, totalFy: 0 }]);
    expect(diff.loadCases.changed).toEqual([]);
    expect(diff.results.map((r) => [r.kind, r.name, r.presence])).toEqual([['case', 'W', 'added']]);
    const w = diff.results[0]!;
    // Hand: ΣFx: R_A,x = −2; ΣM about A: 4·R_B,y − 2·2 = 0 → R_B,y = 1; ΣFy: R_A,y = −1.
    const rx = Object.fromEntries(w.reactions.map((x) => [`${x.at}.${x.component}`, x]));
    expect(rx['A.rx']!.after).toBeCloseTo(-2, 9);
    expect(rx['A.rx']!.before).toBeNull();
    expect(rx['A.rx']!.difference).toBeNull();
    expect(rx['B.ry']!.after).toBeCloseTo(1, 9);
    expect(rx['A.ry']!.after).toBeCloseTo(-1, 9);
    expect(revisionDiffLines(diff).find((l) => l.kind === 'loads')!.text).toBe('case W added (1 load)');
  });

  it('a removed member, support and combination change: counted from hand-made results', () => {
    const model = (members: [string, string][]): TrussModel =>
      modelFromSketch({
        joints: [
          ['A', 0, 0],
          ['B', 3, 0],
          ['C', 3, 3],
          ['D', 0, 3],
        ],
        members,
        supports: [{ at: 'A', kind: 'pin' }, { at: 'B', kind: 'roller' }],
        cases: [{ id: 'D1', loads: [['C', 0, -6]] }],
        combinations: [{ name: 'C1', factors: { D1: 1.35 } }],
      });
    const square: [string, string][] = [
      ['A', 'B'],
      ['B', 'C'],
      ['C', 'D'],
      ['D', 'A'],
      ['A', 'C'],
    ];
    const before = model([...square, ['B', 'D']]);
    const after = model(square);
    after.supports = [{ joint: 'A', kind: 'pin' }, { joint: 'B', kind: 'roller', angleDeg: 80 }];
    after.combinations = [{ name: 'C1', factors: { D1: 1.2 } }];
    // Hand-made results: only BD's force goes (it has none now) and CD changes from −1 to 0.
    const results = (forces: Record<string, number>): ComparedAnalysis => ({
      classification: { kind: 'determinate' },
      cases: [{ caseId: 'D1', caseName: 'D1', forces, reactions: [{ joint: 'A', tag: 'A', rx: 0, ry: 0 }] }],
      combinations: [],
    });
    const diff = revisionDiff(
      { model: before, analysis: { ...results({ AB: 2, CD: -1, BD: 1.4142 }), classification: { kind: 'indeterminate' } } },
      { model: after, analysis: results({ AB: 2, CD: 0 }) },
    );
    expect(diff.geometry.membersRemoved).toEqual([{ tag: 'BD', from: 'B', to: 'D' }]);
    expect(diff.geometry.membersAdded).toEqual([]);
    expect(diff.supports.changed).toEqual([{ joint: 'B', before: { joint: 'B', kind: 'roller', angleDeg: 90 }, after: { joint: 'B', kind: 'roller', angleDeg: 80 } }]);
    expect(diff.combinations.changed).toEqual([{ name: 'C1', factors: [{ caseId: 'D1', before: 1.35, after: 1.2 }], clause: null }]);
    expect(diff.classification).toEqual({ before: 'indeterminate', after: 'determinate' });
    expect(diff.results[0]!.forces).toEqual([
      { at: 'CD', component: 'N', before: -1, after: 0, difference: 1 },
      { at: 'BD', component: 'N', before: 1.4142, after: null, difference: null },
    ]);
    const lines = Object.fromEntries(revisionDiffLines(diff).map((l) => [l.kind, l.text]));
    expect(lines.geometry).toBe('member BD removed');
    expect(lines.supports).toBe('B roller → roller (90° → 80°)');
    expect(lines.combinations).toBe('C1 factors changed');
    expect(lines.results).toBe('stability indeterminate → determinate; forces of 1 member changed, by up to 1.00\u202fkN (case D1)');
  });

  it('nothing changed when only the ids are new (a re-imported drawing): things are matched by tag', () => {
    const a = side(triangle(10));
    const renamed = modelFromSketch(triangle(10));
    const id = (j: string) => `j-${j}`;
    renamed.joints = renamed.joints.map((j) => ({ ...j, id: id(j.id) }));
    renamed.members = renamed.members.map((m) => ({ ...m, id: `m-${m.id}`, from: id(m.from), to: id(m.to) }));
    renamed.supports = renamed.supports.map((s) => ({ ...s, joint: id(s.joint) }));
    renamed.loadCases = renamed.loadCases.map((c) => ({ ...c, loads: c.loads.map((l) => ({ ...l, joint: id(l.joint) })) }));
    const diff = revisionDiff(a, { model: renamed, analysis: trussSolve(renamed) });
    expect(diff.unchanged).toBe(true);
    expect(revisionDiffLines(diff).every((l) => l.text === 'no change')).toBe(true);
  });
});

describe('forceDiffers (relative 1e-4 of the larger value, and above 1e-6 kN)', () => {
  it('reads 0.005 % as the same and 0.02 % as a change; round-off on a zero-force member as no change', () => {
    expect(forceDiffers(100, 100.005)).toBe(false);
    expect(forceDiffers(100, 100.02)).toBe(true);
    expect(forceDiffers(1e-13, -2e-13)).toBe(false);
    expect(forceDiffers(0, 0.01)).toBe(true);
  });
});

describe('stepsDiff', () => {
  const step = (id: string, content: string, number?: string, title = id, caseId = 'D') => ({ id, number, title, caseId, content });
  it('marks a step whose equations differ, a new step, a removed one; the rest unchanged in order', () => {
    const d = stepsDiff(
      [step('case-D/joint-A', 'x=1', '6.1'), step('case-D/joint-B', 'y=2', '6.2'), step('case-D/joint-C', 'z=3', '6.3')],
      [step('case-D/joint-A', 'x=1', '6.1'), step('case-D/joint-B', 'y=5', '6.2'), step('case-D/joint-E', 'w=0', '6.3')],
    );
    expect(d.unchanged).toEqual(['case-D/joint-A']);
    expect(d.changed).toEqual([
      { id: 'case-D/joint-B', number: '6.2', title: 'case-D/joint-B', caseId: 'D', change: 'changed' },
      { id: 'case-D/joint-E', number: '6.3', title: 'case-D/joint-E', caseId: 'D', change: 'added' },
    ]);
    expect(d.removed).toEqual([{ id: 'case-D/joint-C', number: '6.3', title: 'case-D/joint-C', caseId: 'D' }]);
  });
  it('matches a step whose id moved by its case and title', () => {
    const d = stepsDiff([step('case-D/joint-j1', 'x', '6.1', 'Joint A')], [step('case-D/joint-j9', 'x', '6.1', 'Joint A')]);
    expect(d).toEqual({ changed: [], removed: [], unchanged: ['case-D/joint-j9'] });
  });
});

import katex from 'katex';
import { describe, expect, it } from 'vitest';
import { caseSteps } from './steps';
import { stepToKatex } from './katex';
import { trussSolve } from './solve';
import { modelFromSketch, parallelChordSketch, type TrussSketch } from './test-trusses';

const king = (cases: TrussSketch['cases'], combinations: TrussSketch['combinations'] = []): TrussSketch => ({
  joints: [['A', 0, 0], ['B', 8, 0], ['C', 4, 3], ['D', 4, 0]],
  members: [['A', 'C'], ['C', 'B'], ['A', 'D'], ['D', 'B'], ['C', 'D']],
  supports: [{ at: 'A', kind: 'pin' }, { at: 'B', kind: 'roller' }],
  cases,
  combinations,
});

describe('zero-force members (the two joint rules of the method of joints, textbook)', () => {
  it('when removing a rule-2 member leaves another joint with three members, two collinear, then the second pass finds its third member', () => {
    // Rafter AC split at E (collinear AE, EC) with a strut ED; load only at the apex C.
    const r = trussSolve(
      modelFromSketch({
        joints: [['A', 0, 0], ['B', 8, 0], ['C', 4, 3], ['D', 4, 0], ['E', 2, 1.5]],
        members: [['A', 'E'], ['E', 'C'], ['C', 'B'], ['A', 'D'], ['D', 'B'], ['C', 'D'], ['E', 'D']],
        supports: [{ at: 'A', kind: 'pin' }, { at: 'B', kind: 'roller' }],
        cases: [{ id: 'S', loads: [['C', 0, -40]] }],
      }),
    );
    const c = r.cases[0];
    expect(c.zeroForce.map((z) => [z.member, z.joint, z.rule, z.pass])).toEqual([
      ['ED', 'E', 2, 1],
      ['CD', 'D', 2, 2],
    ]);
    expect(c.zeroForce[0].collinear).toEqual(['AE', 'EC']);
    expect(c.forces.ED).toBe(0);
    expect(c.forces.CD).toBe(0);
    expect(c.residual).toBeLessThanOrEqual(1e-9 * 40);
  });

  it('when an unloaded, unsupported joint has two non-collinear members, then rule 1 makes both zero (Howe end: U0)', () => {
    const c = trussSolve(modelFromSketch(parallelChordSketch('howe', 4, 2, 2, 10))).cases[0];
    const at = c.zeroForce.filter((z) => z.joint === 'U0').map((z) => [z.member, z.rule]);
    expect(at.sort()).toEqual([['U0L0', 1], ['U0U1', 1]]);
  });

  it('when the load moves onto the joint, then the rule no longer applies there (findings are per load case)', () => {
    const r = trussSolve(modelFromSketch(king([{ id: 'C', loads: [['C', 0, -10]] }, { id: 'D', loads: [['D', 0, -10]] }])));
    expect(r.cases[0].zeroForce.map((z) => z.member)).toEqual(['CD']);
    expect(r.cases[1].zeroForce).toEqual([]);
  });
});

describe('symmetry', () => {
  it('when the geometry, supports and loads mirror about mid-span, then the symmetry and equal pair forces are reported', () => {
    const r = trussSolve(modelFromSketch(parallelChordSketch('pratt', 6, 3, 4, 10)));
    expect(r.symmetry.detected).toBe(true);
    expect(r.symmetry.axisX).toBeCloseTo(9, 12);
    expect(r.symmetry.memberPairs).toContainEqual(['U0L1', 'L5U6']);
    expect(r.symmetry.memberPairs).toContainEqual(['U3L3', 'U3L3']);
    expect(r.cases[0].symmetry.loadsSymmetric).toBe(true);
    for (const [a, b] of r.symmetry.memberPairs) expect(r.cases[0].forces[a]).toBeCloseTo(r.cases[0].forces[b], 9);
  });

  it('when one load is off-centre, then the case is reported as not symmetric; when a joint moves, the geometry is not symmetric', () => {
    const r = trussSolve(modelFromSketch(king([{ id: 'X', loads: [['C', 2, -10]] }])));
    expect(r.symmetry.detected).toBe(true);
    expect(r.cases[0].symmetry).toEqual({ loadsSymmetric: false, maxPairDifference: null });
    const s = king([{ id: 'X', loads: [['C', 0, -10]] }]);
    s.joints[2] = ['C', 4.5, 3];
    expect(trussSolve(modelFromSketch(s)).symmetry.detected).toBe(false);
  });
});

describe('combinations and envelope', () => {
  // King-post: P at C gives AC = CB = −5P/6, AD = DB = +2P/3 (method of joints by hand).
  // Uplift case W: 30 kN up at C. Factors in the style of ASCE/SEI 7-16 §2.3.1 (1.4D; 1.2D+1.6S;
  // 0.9D+1.0W) — the factor values are given here, not taken from the built-in sets.
  const D = 20;
  const S = 15;
  const W = 30;
  const sketch = king(
    [
      { id: 'D', loads: [['C', 0, -D]] },
      { id: 'S', loads: [['C', 0, -S]] },
      { id: 'W', loads: [['C', 0, W]] },
    ],
    [
      { name: 'C1', factors: { D: 1.4 }, clause: 'ASCE/SEI 7-16 §2.3.1 (1)' },
      { name: 'C2', factors: { D: 1.2, S: 1.6 }, clause: 'ASCE/SEI 7-16 §2.3.1 (3)' },
      { name: 'C5', factors: { D: 0.9, W: 1.0 }, clause: 'ASCE/SEI 7-16 §2.3.1 (6)' },
    ],
  );

  it('when combinations are given, then each is the factored sum of the case results with its clause kept', () => {
    const r = trussSolve(modelFromSketch(sketch));
    const byName = Object.fromEntries(r.combinations.map((c) => [c.name, c]));
    const rafter = (P: number) => (-5 * P) / 6;
    expect(byName.C2.forces.AC).toBeCloseTo(rafter(1.2 * D + 1.6 * S), 9);
    expect(byName.C5.forces.AC).toBeCloseTo(rafter(0.9 * D - W), 9);
    expect(byName.C2.reactions[1].ry).toBeCloseTo((1.2 * D + 1.6 * S) / 2, 9);
    expect(byName.C2.clause).toBe('ASCE/SEI 7-16 §2.3.1 (3)');
    for (const c of r.combinations) expect(c.residual).toBeLessThanOrEqual(1e-9 * 100);
  });

  it('when the envelope is built, then each member has its largest tension and compression with the governing combination', () => {
    const r = trussSolve(modelFromSketch(sketch));
    expect(r.envelopeSource).toBe('combinations');
    const ac = r.envelope.find((e) => e.member === 'AC')!;
    expect(ac.maxCompression).toBeCloseTo((-5 * (1.2 * D + 1.6 * S)) / 6, 9);
    expect(ac.maxCompressionCombo).toBe('C2');
    expect(ac.maxTension).toBeCloseTo((-5 * (0.9 * D - W)) / 6, 9);
    expect(ac.maxTensionCombo).toBe('C5');
    expect(ac.governing).toBe('C2');
    const cd = r.envelope.find((e) => e.member === 'CD')!;
    expect([cd.maxTensionCombo, cd.maxCompressionCombo]).toEqual([null, null]);
  });
});

describe('steps as KaTeX', () => {
  it('when every step of a determinate, a simultaneous and a stiffness solution is rendered by KaTeX, then all render without error and ids are unique anchors', () => {
    const models = [
      modelFromSketch(king([{ id: 'D', loads: [['C', 0, -10]] }])),
      // Two pins: reactions found at the joints (r = 4), a three-hinged frame shape.
      modelFromSketch({
        joints: [['A', 0, 0], ['B', 4, 0], ['C', 2, 3], ['E', 6, 3], ['F', 8, 0]],
        members: [['A', 'B'], ['A', 'C'], ['B', 'C'], ['C', 'E'], ['B', 'E'], ['E', 'F']],
        supports: [{ at: 'A', kind: 'pin' }, { at: 'F', kind: 'pin' }],
        cases: [{ id: 'live 1', loads: [['E', 5, -10]] }],
      }),
      modelFromSketch({ ...king([{ id: 'D', loads: [['C', 0, -10]] }]), supports: [{ at: 'A', kind: 'pin' }, { at: 'B', kind: 'pin' }], EA: 1e5 }),
    ];
    const ids = new Set<string>();
    let lines = 0;
    for (const model of models) {
      const r = trussSolve(model);
      expect(r.cases[0].method).toBe(['joints', 'joints-and-simultaneous', 'stiffness'][models.indexOf(model)]);
      const steps = [r.classification.step, ...r.cases.flatMap((c) => caseSteps(c))];
      for (const st of steps) {
        expect(st.id).toMatch(/^[A-Za-z0-9_/-]+$/);
        expect(ids.has(`${models.indexOf(model)}:${st.id}`)).toBe(false);
        ids.add(`${models.indexOf(model)}:${st.id}`);
        for (const line of stepToKatex(st)) {
          expect(() => katex.renderToString(line, { throwOnError: true, displayMode: true })).not.toThrow();
          lines++;
        }
      }
    }
    expect(lines).toBeGreaterThan(30);
  });

  it('when a joint step is rendered, then its equations carry the substituted numbers and the result is marked (T) or (C)', () => {
    const r = trussSolve(modelFromSketch(king([{ id: 'D', loads: [['C', 0, -100]] }])));
    const stA = r.cases[0].jointSteps.find((s) => s.joint === 'A')!;
    const tex = stepToKatex(stA).join('\n');
    expect(tex).toContain('\\Sigma F_y = 0:\\quad 0.600\\,F_{\\text{AC}} + 50.000 = 0');
    expect(tex).toContain('F_{\\text{AC}} = -83.333\\ \\mathrm{kN}\\ (\\mathrm{C})');
    expect(tex).toContain('F_{\\text{AD}} = 66.667\\ \\mathrm{kN}\\ (\\mathrm{T})');
  });
});

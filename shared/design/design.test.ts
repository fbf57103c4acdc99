import { describe, expect, it } from 'vitest';
import { trussSolve } from '@shared/solver/solve';
import { modelFromSketch, type TrussSketch } from '@shared/solver/test-trusses';
import { designCheck, type DesignGroup } from './design';
import { DesignError } from './errors';
import { materialValidate, steelGrade } from './materials';
import { sectionProperties } from './sections';

// King-post truss (invented example): A (0,0) pin, B (8,0) roller, apex C (4,3), D (4,0).
// Dead load 100 kN down at C; wind 200 kN up at C. Rafters AC, CB: −5P/6, tie AD, DB: +2P/3
// by the method of joints (closed form).
const sketch: TrussSketch = {
  joints: [['A', 0, 0], ['B', 8, 0], ['C', 4, 3], ['D', 4, 0]],
  members: [['A', 'C'], ['C', 'B'], ['A', 'D'], ['D', 'B'], ['C', 'D']],
  supports: [{ at: 'A', kind: 'pin' }, { at: 'B', kind: 'roller' }],
  cases: [
    { id: 'D', loads: [['C', 0, -100]] },
    { id: 'W', loads: [['C', 0, 200]] },
  ],
  combinations: [
    { name: 'C1', factors: { D: 1.4 } },
    { name: 'C2', factors: { D: 0.9, W: 1.0 } },
  ],
};
const model = modelFromSketch(sketch);
const analysis = trussSolve(model);
const group = (over: Partial<DesignGroup> = {}): DesignGroup => ({
  name: 'all',
  members: 'all',
  material: steelGrade('A992'),
  section: sectionProperties({ shape: 'properties', A: 2000, rx: 40, ry: 40 }, 'all'),
  ...over,
});

describe('designCheck over a truss and its combinations', () => {
  it('rafter AC reverses (C1 −116.67 kN, C2 +91.67 kN): both senses checked, compression governs', () => {
    const res = designCheck(model, analysis, { standard: 'aisc360-16-lrfd', groups: [group()] });
    const ac = res.find((r) => r.member === 'AC')!;
    expect(ac.reversal).toBe(true);
    expect(ac.compression!.force).toBeCloseTo(-1.4 * (500 / 6), 9);
    expect(ac.compression!.combination).toBe('C1');
    expect(ac.tension!.force).toBeCloseTo(-(0.9 * 100 - 200) * (5 / 6), 9);
    expect(ac.tension!.combination).toBe('C2');
    // AISC 360-16 E3 by hand: Lc/r = 5000/40 = 125 > 4.71√(29 000/50) = 113.4 → Fcr = 0.877·Fe
    // (A992 preset: E = 29 000 ksi; MPa per ksi = 4448.2216152605 N / 645.16 mm², NIST SP 811).
    const Fe = (Math.PI ** 2 * 29_000 * (4448.2216152605 / 645.16)) / 125 ** 2;
    const phiPn = (0.9 * 0.877 * Fe * 2000) / 1000;
    expect(ac.compression!.capacity).toBeCloseTo(phiPn, 9);
    expect(ac.checks.find((c) => c.clause === 'AISC 360-16 E1')!.ratio).toBeCloseTo((1.4 * 500) / 6 / phiPn, 9);
    // The E2 slenderness 125/200 = 0.625 is above the strength ratio 0.585, so it sets the utilisation.
    expect(ac.utilisation).toBeCloseTo(125 / 200, 9);
    expect(ac.governing).toBe('C1');
    expect(ac.combinations.map((c) => c.name)).toEqual(['C1', 'C2']);
    // C2 (tension): the larger of force/capacity and the D1 slenderness 125/300.
    expect(Math.abs(ac.tension!.force) / ac.tension!.capacity).toBeLessThan(125 / 300);
    expect(ac.combinations[1].ratio).toBeCloseTo(125 / 300, 9);
  });

  it('king post CD carries no force: utilisation 0, no governing combination', () => {
    const res = designCheck(model, analysis, { standard: 'aisc360-16-lrfd', groups: [group()] });
    const cd = res.find((r) => r.member === 'CD')!;
    expect(cd.utilisation).toBe(0);
    expect(cd.governing).toBeNull();
    expect(cd.pass).toBe(true);
  });

  it('a slenderness beyond the E2 limit is a failure with the limit written, even when the force is small', () => {
    const thin = group({ section: sectionProperties({ shape: 'properties', A: 20_000, rx: 20, ry: 20 }, 'all') });
    const res = designCheck(model, analysis, { standard: 'aisc360-16-lrfd', groups: [thin] });
    const ac = res.find((r) => r.member === 'AC')!;
    const e2 = ac.checks.find((c) => c.clause === 'AISC 360-16 E2')!;
    expect(e2.slenderness).toEqual({ value: 250, limit: 200 });
    expect(ac.utilisation).toBeCloseTo(1.25, 9);
    expect(ac.pass).toBe(false);
    expect(ac.compression!.steps.find((s) => s.clause.startsWith('AISC 360-16 E2'))!.result).toMatch(/> 200: fails/);
  });

  it('later groups override earlier ones; out-of-plane length from brace spacing is used', () => {
    const chord = group({ name: 'rafters', members: ['AC', 'CB'], section: sectionProperties({ shape: 'properties', A: 2000, rx: 40, ry: 20 }, 'rafters'), Ly: 2.5 });
    const res = designCheck(model, analysis, { standard: 'aisc360-16-lrfd', groups: [group(), chord] });
    const ac = res.find((r) => r.member === 'AC')!;
    expect(ac.group).toBe('rafters');
    expect(ac.checks.find((c) => c.clause === 'AISC 360-16 E2')!.slenderness!.value).toBeCloseTo(125, 9); // max(5000/40, 2500/20)
    expect(res.find((r) => r.member === 'AD')!.group).toBe('all');
  });

  it('EN 1993-1-1: S355 with a given curve and γM1; bad γM1 is refused', () => {
    const res = designCheck(model, analysis, { standard: 'en1993-1-1', groups: [group({ material: steelGrade('S355'), curve: 'b' })], en1993: { gammaM1: 1.1 } });
    expect(res.find((r) => r.member === 'AC')!.compression!.steps.some((s) => s.substituted.includes('/ 1.1'))).toBe(true);
    expect(() => designCheck(model, analysis, { standard: 'en1993-1-1', groups: [group({ material: steelGrade('S355') })], en1993: { gammaM1: 0 } })).toThrow(/gammaM1 must be a positive number/);
  });

  it('bad input: a member without a section, timber under a steel basis, timber without design values', () => {
    const partial = group({ members: ['AC', 'CB', 'AD', 'DB'] });
    expect(() => designCheck(model, analysis, { standard: 'aisc360-16-lrfd', groups: [partial] })).toThrow(DesignError);
    expect(() => designCheck(model, analysis, { standard: 'aisc360-16-lrfd', groups: [partial] })).toThrow(/Member CD has no section and material/);
    const timber = group({ material: { kind: 'timber', Ft: 6, Fc: 10, Emin: 4000, E: 9000, c: 0.8 } });
    expect(() => designCheck(model, analysis, { standard: 'aisc360-16-lrfd', groups: [timber] })).toThrow(/is timber but the design basis/);
    expect(() => materialValidate({ kind: 'timber', Ft: 6, Fc: 10, E: 9000, c: 0.8 } as never, 'group W')).toThrow(/has no Emin/);
    expect(() => steelGrade('S420')).toThrow(/not preset/);
  });
});

describe('checks shared between members of one group and one length', () => {
  it('each member keeps the capacity of its own buckling length: rafters (5 m) and ties (4 m) differ, equal lengths agree', () => {
    // Rafters AC, CB are 5 m (3-4-5 triangle), ties AD, DB 4 m, post CD 3 m: closed-form lengths.
    const res = designCheck(model, analysis, { standard: 'aisc360-16-lrfd', groups: [group()] });
    const by = (id: string) => res.find((r) => r.member === id)!;
    const { compression: ac } = by('AC');
    const { compression: cb } = by('CB');
    expect(ac!.capacity).toBe(cb!.capacity);
    expect(ac!.steps).toEqual(cb!.steps);
    // The same section at 4 m buckles less than at 5 m: a tie's compression capacity (under C2's
    // uplift the ties compress) must be the larger, so a memo keyed on the wrong thing would fail.
    const ad = by('AD').compression!;
    expect(ad.capacity).toBeGreaterThan(ac!.capacity);
    expect(ad.steps).not.toEqual(ac!.steps);
  });
});

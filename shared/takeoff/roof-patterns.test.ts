import katex from 'katex';
import { describe, expect, it } from 'vitest';
import type { Joint } from '@shared/model/truss';
import { TakeoffError, roofTakeoff, takeoffStepKatex, type RoofTakeoffInput } from './index';

/** Flat top chord, purlins 3 m apart (an invented roof). */
const flat: Joint[] = [0, 3, 6, 9].map((x, i) => ({ id: `f${i}`, tag: `P${i + 1}`, x, y: 2 }));

function input(overrides: Partial<RoofTakeoffInput> = {}): RoofTakeoffInput {
  return {
    joints: flat,
    topChordJoints: flat.map((j) => j.id),
    areaLoads: [
      { caseId: 'D', q: 0.9, basis: 'plan', category: 'dead' },
      { caseId: 'S', q: 1.2, basis: 'plan', category: 'snow', patterns: true },
    ],
    spacing: 5,
    trussCount: 4,
    trussIndex: 1,
    method: 'exact',
    ...overrides,
  };
}

describe('pattern loading in the roof loading', () => {
  it('when snow is pattern-loaded over three equal spans, then the first interior truss takes 1.2 wL with spans 1 and 2 loaded, the dead case 1.1 wL', () => {
    const result = roofTakeoff(input());
    // AISC Manual Table 3-23, three equal spans (from memory): interior reaction 1.10 wL with all
    // spans loaded, 1.20 wL with the two spans either side loaded.
    const L = 5;
    const snow = result.cases.find((c) => c.caseId === 'S')!;
    const dead = result.cases.find((c) => c.caseId === 'D')!;
    expect(snow.pattern?.label).toBe('spans 1 and 2 loaded');
    const interior = snow.purlins.find((p) => p.joint === 'f1')!;
    // w = q × b = 1.2 × 3 (plan width of an interior purlin).
    expect(interior.exact).toBeCloseTo(1.2 * 3 * 1.2 * L, 10);
    expect(snow.loads.find((l) => l.joint === 'f1')!.fy).toBeCloseTo(-1.2 * 3 * 1.2 * L, 10);
    expect(dead.pattern).toBeUndefined();
    expect(dead.purlins.find((p) => p.joint === 'f1')!.exact).toBeCloseTo(0.9 * 3 * 1.1 * L, 10);
    const step = result.steps.find((s) => s.kind === 'span-pattern');
    expect(step?.title).toContain('spans 1 and 2 loaded');
    expect(step?.note).toMatch(/ASCE\/SEI 7-16 4\.3\.3/);
    expect(step?.note).toMatch(/7\.5/);
  });

  it('when roof live load is pattern-loaded on the end truss of two spans, then it takes 7/16 wL with span 1 loaded', () => {
    const result = roofTakeoff(
      input({ areaLoads: [{ caseId: 'Lr', q: 1, basis: 'plan', category: 'roof-live', patterns: true }], trussCount: 3, trussIndex: 0, spacing: 4 }),
    );
    const c = result.cases[0];
    expect(c.pattern?.label).toBe('span 1 loaded');
    // AISC Manual Table 3-23, two equal spans, one span loaded: R1 = 7/16 wL (from memory).
    expect(c.pattern?.exactPerUnit).toBeCloseTo((7 / 16) * 4, 12);
    expect(c.purlins.find((p) => p.joint === 'f1')!.exact).toBeCloseTo(3 * (7 / 16) * 4, 12);
  });

  it('when the pattern steps are written as KaTeX, then they render in SI and US and name the pattern', () => {
    const result = roofTakeoff(input());
    const steps = result.steps.filter((s) => s.kind === 'span-pattern' || (s.kind === 'purlin-reaction' && s.caseId === 'S'));
    expect(steps.length).toBeGreaterThan(1);
    for (const step of steps) {
      for (const system of ['si', 'us'] as const) {
        const source = takeoffStepKatex(step, { system });
        expect(() => katex.renderToString(source, { displayMode: true, throwOnError: true })).not.toThrow();
        expect(source).toContain('spans 1 and 2 loaded');
      }
    }
  });

  it('when a dead or wind case asks for span patterns, then it is refused in one sentence', () => {
    for (const category of ['dead', 'wind', 'other'] as const) {
      let error: unknown;
      try {
        roofTakeoff(input({ areaLoads: [{ caseId: 'X', q: 1, basis: 'plan', category, patterns: true }] }));
      } catch (e) {
        error = e;
      }
      expect(error).toBeInstanceOf(TakeoffError);
      expect((error as TakeoffError).code).toBe('pattern-not-allowed');
      expect((error as TakeoffError).message).toMatch(new RegExp(`is a ${category} case`));
    }
  });
});

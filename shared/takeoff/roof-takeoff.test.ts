import katex from 'katex';
import { describe, expect, it } from 'vitest';
import type { Joint } from '@shared/model/truss';
import { TakeoffError, roofTakeoff, takeoffStepKatex, type RoofTakeoffInput } from './index';

/** Pitched roof truss, span 12 m, rise 3 m (pitch 1:2), top-chord joints every 2 m on plan. */
const pitched: Joint[] = [
  { id: 'j0', tag: 'A', x: 0, y: 0 },
  { id: 'j1', tag: 'B', x: 2, y: 1 },
  { id: 'j2', tag: 'C', x: 4, y: 2 },
  { id: 'j3', tag: 'D', x: 6, y: 3 },
  { id: 'j4', tag: 'E', x: 8, y: 2 },
  { id: 'j5', tag: 'F', x: 10, y: 1 },
  { id: 'j6', tag: 'G', x: 12, y: 0 },
  { id: 'j7', tag: 'H', x: 4, y: 0 },
];
const pitchedTop = ['j0', 'j1', 'j2', 'j3', 'j4', 'j5', 'j6'];

/** Flat top chord with joints 3.0 m apart (y = 2 m). */
const flat: Joint[] = [0, 3, 6, 9, 12].map((x, i) => ({ id: `f${i}`, tag: `P${i + 1}`, x, y: 2 }));
const flatTop = flat.map((j) => j.id);

function base(overrides: Partial<RoofTakeoffInput> = {}): RoofTakeoffInput {
  return {
    joints: flat,
    topChordJoints: flatTop,
    areaLoads: [{ caseId: 'D', q: 1.5, basis: 'plan' }],
    spacing: 4,
    trussCount: 6,
    trussIndex: 1,
    method: 'exact',
    ...overrides,
  };
}

describe('tributary widths and line loads', () => {
  it('when purlins are 3.0 m apart under 1.5 kPa, then an interior purlin carries w = q × s = 4.5 kN/m and an eave purlin 2.25 kN/m', () => {
    // Tributary width = half the distance to each neighbour; w = q × s (common practice, no source).
    const result = roofTakeoff(base());
    const rows = result.cases[0].purlins;
    expect(result.purlins.map((p) => p.widthPlan)).toEqual([1.5, 3, 3, 3, 1.5]);
    expect(rows[2].w).toBeCloseTo(4.5, 12);
    expect(rows[0].w).toBeCloseTo(2.25, 12);
  });

  it('when trusses are 2.0 m apart, then the tributary reaction is P = w × 2.0 m = 9.0 kN on an interior truss and 4.5 kN on an end truss', () => {
    // Interior panel point P = w × panel length; end P/2 (common practice, no source).
    const interior = roofTakeoff(base({ spacing: 2, trussCount: 5, trussIndex: 2, method: 'tributary' }));
    expect(interior.cases[0].purlins[2].tributary).toBeCloseTo(9.0, 12);
    expect(interior.caseLoads.D[2]).toMatchObject({ joint: 'f2', fx: 0, fy: expect.closeTo(-9.0, 12) });
    const end = roofTakeoff(base({ spacing: 2, trussCount: 5, trussIndex: 4, method: 'tributary' }));
    expect(end.trussPosition).toBe('end');
    expect(end.cases[0].purlins[2].tributary).toBeCloseTo(4.5, 12);
  });

  it('when the roof rises 1:2, then a purlin on the slope has a sloped width of √5 m and a plan width of 2 m', () => {
    const result = roofTakeoff(base({ joints: pitched, topChordJoints: pitchedTop }));
    const byTag = Object.fromEntries(result.purlins.map((p) => [p.tag, p]));
    expect(byTag.A.widthSlope).toBeCloseTo(Math.sqrt(5) / 2, 12);
    expect(byTag.A.widthPlan).toBeCloseTo(1, 12);
    expect(byTag.C.widthSlope).toBeCloseTo(Math.sqrt(5), 12);
    // The ridge purlin takes half of each slope.
    expect(byTag.D.widthSlope).toBeCloseTo(Math.sqrt(5), 12);
    expect(byTag.D.widthPlan).toBeCloseTo(2, 12);
  });

  it('when 0.50 kPa is given on the slope of a 1:2 roof, then it acts as 0.50/cos θ = 0.5590 kPa on plan', () => {
    // Load per m² of slope → per m² of plan: divide by cos θ; rise 1:2, cos θ = 2/√5 (geometry).
    const result = roofTakeoff(
      base({
        joints: pitched,
        topChordJoints: pitchedTop,
        areaLoads: [
          { caseId: 'D', q: 0.5, basis: 'slope' },
          { caseId: 'S', q: 0.5, basis: 'plan' },
        ],
      }),
    );
    const [slope, plan] = result.cases;
    const cosTheta = 2 / Math.sqrt(5);
    for (let i = 0; i < 7; i++) {
      expect(slope.purlins[i].w / plan.purlins[i].w).toBeCloseTo(1 / cosTheta, 12);
    }
    const step = result.steps.find((s) => s.kind === 'line-load' && s.caseId === 'D' && s.jointTag === 'C')!;
    expect(step.values.find((v) => v.key === 'qPlan')!.value).toBeCloseTo(0.559017, 6);
    // Plan basis: 0.5 kPa × 2.0 m = 1.0 kN/m on an interior purlin.
    expect(plan.purlins[2].w).toBeCloseTo(1.0, 12);
  });

  it('when purlins are picked on some top-chord joints only, then widths are measured between the picked purlins', () => {
    const result = roofTakeoff(
      base({ joints: pitched, topChordJoints: pitchedTop, purlinJoints: ['j0', 'j2', 'j3'] }),
    );
    expect(result.purlins.map((p) => p.tag)).toEqual(['A', 'C', 'D']);
    // C: half of AC (2√5) plus half of CD (√5) along the slope.
    expect(result.purlins[1].widthSlope).toBeCloseTo(1.5 * Math.sqrt(5), 12);
    // D is the end of the list (a ridge purlin of one slope): half its one neighbour distance.
    expect(result.purlins[2].widthPlan).toBeCloseTo(1, 12);
  });
});

describe('continuous purlin over the trusses', () => {
  // Hicks, Civil Engineering Formulas, Table 2.1 "Uniformly loaded continuous beams over equal
  // spans": 5 spans → reactions 15/38, 43/38, 37/38 of wL. w = 4.5 kN/m, L = 4.0 m, wL = 18 kN.
  const fractions = [15 / 38, 43 / 38, 37 / 38, 37 / 38, 43 / 38, 15 / 38];
  for (const [index, fraction] of fractions.entries()) {
    it(`when a purlin runs over 6 trusses at 4.0 m and truss ${index} is chosen, then its reaction is ${fraction.toFixed(4)} wL`, () => {
      const result = roofTakeoff(base({ trussIndex: index }));
      const row = result.cases[0].purlins[2];
      expect(row.w).toBeCloseTo(4.5, 12);
      expect(row.exact).toBeCloseTo(fraction * 18, 10);
      expect(result.caseLoads.D[2].fy).toBeCloseTo(-fraction * 18, 10);
      expect(result.trussPosition).toBe(index === 0 || index === 5 ? 'end' : 'interior');
    });
  }

  it('when exact and tributary reactions are compared, then the difference is +26.7 % at the end truss and −11.6 % at the first interior truss', () => {
    // (1/2 − 15/38)/(15/38) = 4/15 and (1 − 43/38)/(43/38) = −5/43 (Hicks Table 2.1 fractions).
    const end = roofTakeoff(base({ trussIndex: 0 })).cases[0].purlins[1];
    expect(end.tributary).toBeCloseTo(9, 12);
    expect(end.differencePct!).toBeCloseTo((4 / 15) * 100, 9);
    const first = roofTakeoff(base({ trussIndex: 1 })).cases[0].purlins[1];
    expect(first.differencePct!).toBeCloseTo((-5 / 43) * 100, 9);
    const second = roofTakeoff(base({ trussIndex: 2 })).cases[0].purlins[1];
    expect(second.differencePct!).toBeCloseTo((1 / 37) * 100, 9);
  });

  it('when the spacings are unequal, then the middle truss takes the closed-form two-span reaction', () => {
    // Two-span beam, spans L1 and L2 under w: M_B = −w(L1³ + L2³)/(8(L1 + L2)) (three-moment
    // equation with pinned ends); R_B = w(L1 + L2)/2 − M_B/L1 − M_B/L2.
    const [L1, L2] = [3, 5];
    const result = roofTakeoff(base({ spacing: [L1, L2], trussCount: 3, trussIndex: 1 }));
    const w = 4.5;
    const mB = (-w * (L1 ** 3 + L2 ** 3)) / (8 * (L1 + L2));
    const expected = (w * (L1 + L2)) / 2 - mB / L1 - mB / L2;
    expect(result.cases[0].purlins[2].exact).toBeCloseTo(expected, 10);
    expect(result.cases[0].purlins[2].tributary).toBeCloseTo(w * 4, 12);
  });

  it('when two trusses carry the purlin, then exact and tributary agree at half the span each', () => {
    const result = roofTakeoff(base({ spacing: 5, trussCount: 2, trussIndex: 0 }));
    expect(result.cases[0].purlins[2].exact).toBeCloseTo(4.5 * 2.5, 12);
    expect(result.cases[0].purlins[2].differencePct).toBeCloseTo(0, 12);
  });

  it('when the area load is zero, then the difference is not a number and is reported as null', () => {
    const result = roofTakeoff(base({ areaLoads: [{ caseId: 'W', q: 0, basis: 'plan' }] }));
    expect(result.cases[0].purlins[0].differencePct).toBeNull();
  });
});

describe('steps for the calc sheet', () => {
  // The engineer's journey: dead 0.9 kPa on the slope, snow 1.2 kPa on plan, trusses at 4.5 m,
  // eight trusses, the second from the end (invented scenario).
  const journey = roofTakeoff({
    joints: pitched,
    topChordJoints: pitchedTop,
    areaLoads: [
      { caseId: 'D', q: 0.9, basis: 'slope' },
      { caseId: 'S', q: 1.2, basis: 'plan' },
    ],
    spacing: 4.5,
    trussCount: 8,
    trussIndex: 1,
    method: 'exact',
  });

  it('when a takeoff is done, then there is a width step per purlin, one beam step, and a line-load and reaction step per purlin and case', () => {
    const count = (kind: string) => journey.steps.filter((s) => s.kind === kind).length;
    expect(count('purlin-width')).toBe(7);
    expect(count('purlin-beam')).toBe(1);
    expect(count('line-load')).toBe(14);
    expect(count('purlin-reaction')).toBe(14);
    expect(new Set(journey.steps.map((s) => s.id)).size).toBe(journey.steps.length);
    for (const step of journey.steps) expect(step.id).toMatch(/^[A-Za-z0-9_/-]+$/);
  });

  it('when every step is written as KaTeX, then KaTeX renders it without error in SI and in US units', () => {
    for (const step of journey.steps) {
      for (const system of ['si', 'us'] as const) {
        const source = takeoffStepKatex(step, { system });
        expect(() => katex.renderToString(source, { displayMode: true, throwOnError: true })).not.toThrow();
      }
    }
  });

  it('when joint tags hold KaTeX special characters, then the steps still render', () => {
    const odd = flat.map((j, i) => ({ ...j, tag: ['U_1', 'a^b', '50%', 'x{y}', 'c\\d'][i] }));
    const result = roofTakeoff(base({ joints: odd }));
    for (const step of result.steps) {
      const source = takeoffStepKatex(step);
      expect(() => katex.renderToString(source, { displayMode: true, throwOnError: true })).not.toThrow();
    }
  });

  it('when a reaction step is written, then it shows c × w = R for both methods and the joint load', () => {
    // 6 trusses at 4.0 m, truss 1: c_exact = 43/38 × 4.0 m = 4.526 m (Hicks Table 2.1), w = 4.5 kN/m.
    const result = roofTakeoff(base());
    const step = result.steps.find((s) => s.kind === 'purlin-reaction' && s.jointTag === 'P3')!;
    const source = takeoffStepKatex(step);
    expect(source).toContain('4.526\\,\\mathrm{m} \\times 4.50\\,\\mathrm{kN/m} = 20.37\\,\\mathrm{kN}');
    expect(source).toContain('4.000\\,\\mathrm{m} \\times 4.50\\,\\mathrm{kN/m} = 18.00\\,\\mathrm{kN}');
    expect(source).toContain('= -11.6\\,\\%');
    expect(source).toContain('= -20.37\\,\\mathrm{kN}');
  });

  it('when a line-load step is written, then it shows q × b = w with the numbers and units', () => {
    const step = journey.steps.find((s) => s.kind === 'line-load' && s.caseId === 'S' && s.jointTag === 'C')!;
    // 1.2 kPa × 2.000 m = 2.40 kN/m
    expect(takeoffStepKatex(step)).toContain('1.20\\,\\mathrm{kPa} \\times 2.000\\,\\mathrm{m} = 2.40\\,\\mathrm{kN/m}');
    // The same in US units: 1.2 kPa = 25.063 psf, 2 m = 6.5617 ft, 2.4 kN/m = 164.45 plf (NIST
    // SP 811 factors). At the default 25.1 psf × 6.56 ft a checker gets 164.66 → 165, not the
    // printed 164, so the operands carry one more decimal: 25.06 × 6.562 = 164.44 → 164.
    expect(takeoffStepKatex(step, { system: 'us' })).toContain('25.06\\,\\mathrm{psf} \\times 6.562\\,\\mathrm{ft} = 164\\,\\mathrm{plf}');
  });

  it('when the chosen method is exact, then the joint loads equal minus the exact reactions and fx is 0', () => {
    for (const c of journey.cases) {
      c.loads.forEach((load, i) => {
        expect(load.fx).toBe(0);
        expect(load.fy).toBeCloseTo(-c.purlins[i].exact, 12);
      });
    }
  });
});

describe('bad input', () => {
  const cases: Array<[string, Partial<RoofTakeoffInput>, string, RegExp]> = [
    ['a zero spacing', { spacing: 0 }, 'spacing-not-positive', /spacing is 0 m/],
    ['a negative spacing in a list', { spacing: [4, -1, 4], trussCount: 4 }, 'spacing-not-positive', /Spacing 2/],
    ['a NaN spacing', { spacing: Number.NaN }, 'non-finite-value', /spacing/],
    ['a spacing list of the wrong length', { spacing: [4, 4] }, 'spacing-count-mismatch', /6 trusses have 5 spacings/],
    ['a truss count of 0', { trussCount: 0, trussIndex: 0 }, 'truss-count-too-small', /at least 2/],
    ['a truss count of 1', { trussCount: 1, trussIndex: 0 }, 'truss-count-too-small', /at least 2/],
    ['a truss index past the last truss', { trussIndex: 6 }, 'truss-index-out-of-range', /choose 0 to 5/],
    ['a negative truss index', { trussIndex: -1 }, 'truss-index-out-of-range', /Truss index -1/],
    ['a purlin off the top chord', { joints: pitched, topChordJoints: pitchedTop, purlinJoints: ['j0', 'j7'] }, 'purlin-not-on-top-chord', /Joint H is not a top-chord joint/],
    ['an unknown purlin joint', { purlinJoints: ['f0', 'nope'] }, 'unknown-joint', /"nope"/],
    ['an unknown top-chord joint', { topChordJoints: ['f0', 'zz'] }, 'unknown-joint', /"zz"/],
    ['a purlin listed twice', { purlinJoints: ['f0', 'f1', 'f1'] }, 'duplicate-purlin', /P2 is listed twice/],
    ['a single purlin', { purlinJoints: ['f0'] }, 'too-few-purlins', /at least two purlins/],
    ['purlins out of order', { purlinJoints: ['f0', 'f2', 'f1'] }, 'purlins-out-of-order', /P3 and P2/],
    ['a NaN area load', { areaLoads: [{ caseId: 'D', q: Number.NaN, basis: 'plan' }] }, 'non-finite-value', /case "D"/],
    ['no area loads', { areaLoads: [] }, 'no-area-loads', /at least one/],
    ['two area loads in one case', { areaLoads: [{ caseId: 'D', q: 1, basis: 'plan' }, { caseId: 'D', q: 1, basis: 'slope' }] }, 'duplicate-load-case', /"D"/],
    ['an unknown basis', { areaLoads: [{ caseId: 'D', q: 1, basis: 'roof' as never }] }, 'unknown-basis', /"roof"/],
    ['an unknown method', { method: 'average' as never }, 'unknown-method', /"average"/],
    ['a joint with a NaN coordinate', { joints: [...flat.slice(0, 4), { id: 'f4', tag: 'P5', x: Number.NaN, y: 2 }] }, 'non-finite-value', /joint P5/],
  ];
  for (const [label, overrides, code, message] of cases) {
    it(`when the takeoff has ${label}, then a TakeoffError '${code}' names the problem`, () => {
      let caught: unknown;
      try {
        roofTakeoff(base(overrides));
      } catch (error) {
        caught = error;
      }
      expect(caught).toBeInstanceOf(TakeoffError);
      expect((caught as TakeoffError).code).toBe(code);
      expect((caught as TakeoffError).message).toMatch(message);
    });
  }
});

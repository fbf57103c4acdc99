import katex from 'katex';
import { describe, expect, it } from 'vitest';
import type { Joint } from '@shared/model/truss';
import { TakeoffError, roofTakeoff, takeoffStepKatex, type RoofTakeoffInput } from './index';

/**
 * Sign convention of these tests (and of the takeoff): +x right, +y up; a pressure p > 0 pushes
 * on the roof surface (towards it), p < 0 is suction. For a panel at angle θ from +x (positive
 * where it rises to the right), the inward normal is (sin θ, −cos θ), so a pressure p on a panel
 * of sloped length s puts F = p·s·(sin θ, −cos θ) per unit length of purlin on the roof — the
 * closed-form resolution of a normal load on an inclined plane (statics, from memory).
 */

/** Gable: eave A (0, 0), ridge B (4, 3), eave C (8, 0) — 3-4-5 panels, sin θ = 0.6, cos θ = 0.8. */
const gable: Joint[] = [
  { id: 'a', tag: 'A', x: 0, y: 0 },
  { id: 'b', tag: 'B', x: 4, y: 3 },
  { id: 'c', tag: 'C', x: 8, y: 0 },
  { id: 'm', tag: 'M', x: 4, y: 0 },
];

function input(overrides: Partial<RoofTakeoffInput> = {}): RoofTakeoffInput {
  return {
    joints: gable,
    topChordJoints: ['a', 'b', 'c'],
    areaLoads: [],
    wind: { caseId: 'W', category: 'wind', q: 0.8, windward: 'left', cWindward: 0.3, cLeeward: -0.6 },
    spacing: 4,
    trussCount: 3,
    trussIndex: 1,
    method: 'exact',
    ...overrides,
  };
}

const byJoint = (loads: { joint: string; fx: number; fy: number }[]) => Object.fromEntries(loads.map((l) => [l.joint, l]));

describe('wind normal to the roof slope', () => {
  it('when wind blows on the left slope of a 3-4-5 gable, then each purlin load is the hand resolution p·½s·(sin θ, −cos θ) times the purlin factor', () => {
    const result = roofTakeoff(input());
    // Purlin factor: two equal spans of 4 m, interior truss: 1.25 L = 5 m (AISC Manual Table 3-23, from memory).
    const c = 1.25 * 4;
    const loads = byJoint(result.caseLoads.W);
    // Windward panel AB: p = 0.8 × 0.3 = 0.24 kPa, ½s = 2.5 m → w_n = 0.6 kN/m, θ = +36.87°.
    const windward = { x: 0.6 * 0.6, y: -0.6 * 0.8 };
    // Leeward panel BC: p = 0.8 × (−0.6) = −0.48 kPa → w_n = −1.2 kN/m, θ = −36.87° (sin −0.6, cos 0.8).
    const leeward = { x: -1.2 * -0.6, y: -(-1.2) * 0.8 };
    expect(loads.a.fx).toBeCloseTo(c * windward.x, 12);
    expect(loads.a.fy).toBeCloseTo(c * windward.y, 12);
    expect(loads.b.fx).toBeCloseTo(c * (windward.x + leeward.x), 12);
    expect(loads.b.fy).toBeCloseTo(c * (windward.y + leeward.y), 12);
    expect(loads.c.fx).toBeCloseTo(c * leeward.x, 12);
    expect(loads.c.fy).toBeCloseTo(c * leeward.y, 12);
    // Pressure on the windward slope pushes the roof downwind and down; suction on the leeward
    // slope lifts it and pulls it downwind.
    expect(loads.a.fx).toBeGreaterThan(0);
    expect(loads.a.fy).toBeLessThan(0);
    expect(loads.c.fy).toBeGreaterThan(0);
    expect(result.wind?.caseId).toBe('W');
    expect(result.steps.filter((s) => s.kind === 'wind-purlin')).toHaveLength(3);
  });

  it('when the wind comes from the right instead, then the coefficients change slopes and the loads mirror', () => {
    const left = byJoint(roofTakeoff(input()).caseLoads.W);
    const right = byJoint(roofTakeoff(input({ wind: { caseId: 'W', q: 0.8, windward: 'right', cWindward: 0.3, cLeeward: -0.6 } })).caseLoads.W);
    // Mirror about x = 4: A ↔ C, fx changes sign, fy stays (symmetry, statics).
    expect(right.c.fx).toBeCloseTo(-left.a.fx, 12);
    expect(right.c.fy).toBeCloseTo(left.a.fy, 12);
    expect(right.a.fx).toBeCloseTo(-left.c.fx, 12);
    expect(right.b.fy).toBeCloseTo(left.b.fy, 12);
  });

  it('when a roof of several pitches carries wind, then the joint loads sum to q·c·(slope area)·(inward normal) over its panels (global equilibrium)', () => {
    // Invented roof: pitches change at each purlin, ridge at x = 7.
    const joints: Joint[] = [
      [0, 0],
      [2.3, 1.1],
      [4.9, 2.6],
      [7, 3.4],
      [9.4, 2.2],
      [12.1, 0.9],
      [14, 0],
    ].map(([x, y], i) => ({ id: `p${i}`, tag: `P${i}`, x, y }));
    const q = 0.93;
    const cW = -0.35;
    const cL = -0.55;
    for (const method of ['exact', 'tributary'] as const) {
      const result = roofTakeoff({
        joints,
        topChordJoints: joints.map((j) => j.id),
        areaLoads: [],
        wind: { caseId: 'W', q, windward: 'left', cWindward: cW, cLeeward: cL },
        spacing: [4.5, 3.9, 4.5, 5.1],
        trussCount: 5,
        trussIndex: 2,
        method,
      });
      const perUnit = method === 'exact' ? result.exactPerUnit : result.tributaryPerUnit;
      let fx = 0;
      let fy = 0;
      for (let i = 0; i + 1 < joints.length; i++) {
        const [a, b] = [joints[i], joints[i + 1]];
        const s = Math.hypot(b.x - a.x, b.y - a.y);
        const coefficient = b.y > a.y ? cW : cL; // left of the ridge rises to the right
        // Inward normal of a panel from a to b (b right of a): (Δy, −Δx)/s.
        fx += q * coefficient * s * ((b.y - a.y) / s);
        fy += q * coefficient * s * (-(b.x - a.x) / s);
      }
      const sumX = result.caseLoads.W.reduce((t, l) => t + l.fx, 0);
      const sumY = result.caseLoads.W.reduce((t, l) => t + l.fy, 0);
      expect(sumX).toBeCloseTo(perUnit * fx, 10);
      expect(sumY).toBeCloseTo(perUnit * fy, 10);
      expect(Math.abs(sumY)).toBeGreaterThan(1);
    }
  });

  it('when a mono-pitch roof has the wind from its high side, then its one slope takes the leeward coefficient', () => {
    const mono: Joint[] = [
      { id: 'l', tag: 'L', x: 0, y: 0 },
      { id: 'h', tag: 'H', x: 6, y: 1.5 },
    ];
    const result = roofTakeoff({
      joints: mono,
      topChordJoints: ['l', 'h'],
      areaLoads: [],
      wind: { caseId: 'W', q: 1, windward: 'right', cLeeward: -0.8 },
      spacing: 5,
      trussCount: 2,
      trussIndex: 0,
      method: 'exact',
    });
    const step = result.steps.find((s) => s.kind === 'wind-purlin');
    expect(step?.kind === 'wind-purlin' && step.halves[0].side).toBe('leeward');
    // One span: each truss takes half, 2.5 m per kN/m. s = √(36 + 2.25); suction pulls along (−sin θ, cos θ)·|p|.
    const s = Math.hypot(6, 1.5);
    const loads = byJoint(result.caseLoads.W);
    expect(loads.l.fy).toBeCloseTo(2.5 * -0.8 * (s / 2) * -(6 / s), 12);
    expect(loads.l.fx).toBeCloseTo(2.5 * -0.8 * (s / 2) * (1.5 / s), 12);
  });

  it('when wind steps are written as KaTeX, then they render in SI and US units and show both components', () => {
    const result = roofTakeoff(input());
    for (const step of result.steps.filter((s) => s.kind === 'wind-purlin')) {
      for (const system of ['si', 'us'] as const) {
        const source = takeoffStepKatex(step, { system });
        expect(() => katex.renderToString(source, { displayMode: true, throwOnError: true })).not.toThrow();
        expect(source).toContain('w_{x,1}');
        expect(source).toContain('\\sin\\theta_{1}');
      }
      expect(step.note).toMatch(/towards the surface/);
    }
  });

  it('when wind and area loads are given together, then both cases are written and the area-load case has no wind in it', () => {
    const result = roofTakeoff(input({ areaLoads: [{ caseId: 'D', q: 0.5, basis: 'slope' }] }));
    expect(Object.keys(result.caseLoads).sort()).toEqual(['D', 'W']);
    expect(result.caseLoads.D.every((l) => l.fx === 0)).toBe(true);
  });
});

describe('wind: bad input', () => {
  const refused = (overrides: Partial<RoofTakeoffInput>, code: string, message: RegExp) => {
    let error: unknown;
    try {
      roofTakeoff(input(overrides));
    } catch (e) {
      error = e;
    }
    expect(error).toBeInstanceOf(TakeoffError);
    expect((error as TakeoffError).code).toBe(code);
    expect((error as TakeoffError).message).toMatch(message);
  };
  it('when a coefficient is given without a velocity pressure, then it is refused naming q', () =>
    refused({ wind: { caseId: 'W', q: null, windward: 'left', cWindward: 0.3 } }, 'wind-without-pressure', /without a velocity pressure q/));
  it('when q is given without coefficients, then it is refused', () =>
    refused({ wind: { caseId: 'W', q: 0.8, windward: 'left' } }, 'wind-without-coefficients', /without pressure coefficients/));
  it('when a slope the roof has lacks its coefficient, then it is refused naming the panel', () =>
    refused({ wind: { caseId: 'W', q: 0.8, windward: 'left', cWindward: 0.3 } }, 'wind-without-coefficients', /B–C is on the leeward slope/));
  it('when q is not finite, then it is refused', () =>
    refused({ wind: { caseId: 'W', q: Infinity, windward: 'left', cWindward: 0.3, cLeeward: -0.6 } }, 'wind-value-not-finite', /finite/));
  it('when q is zero or above 50 kPa, then it is refused', () => {
    refused({ wind: { caseId: 'W', q: 0, windward: 'left', cWindward: 0.3, cLeeward: -0.6 } }, 'wind-pressure-out-of-range', /greater than 0/);
    refused({ wind: { caseId: 'W', q: 60, windward: 'left', cWindward: 0.3, cLeeward: -0.6 } }, 'wind-pressure-out-of-range', /at most 50 kPa/);
  });
  it('when a coefficient is not finite or beyond ±5, then it is refused', () => {
    refused({ wind: { caseId: 'W', q: 0.8, windward: 'left', cWindward: Number.NaN, cLeeward: -0.6 } }, 'wind-value-not-finite', /windward/);
    refused({ wind: { caseId: 'W', q: 0.8, windward: 'left', cWindward: 0.3, cLeeward: -7 } }, 'wind-coefficient-out-of-range', /leeward pressure coefficient is -7/);
  });
  it('when the wind case is not a wind case, or is also an area-load case, then it is refused', () => {
    refused({ wind: { caseId: 'S', category: 'snow', q: 0.8, windward: 'left', cWindward: 0.3, cLeeward: -0.6 } }, 'wind-case-not-wind', /snow case/);
    refused(
      { areaLoads: [{ caseId: 'W', q: 0.5, basis: 'slope' }], wind: { caseId: 'W', q: 0.8, windward: 'left', cWindward: 0.3, cLeeward: -0.6 } },
      'duplicate-load-case',
      /both an area load and the wind/,
    );
  });
});

import { lusolve, matrix, type Matrix } from 'mathjs';
import { describe, expect, it } from 'vitest';
import { continuousBeamSolve, continuousBeamTributary } from './continuous-beam';
import { TakeoffError } from './errors';

/**
 * Independent reference: Euler–Bernoulli beam elements (one per span, cubic Hermite shape
 * functions, consistent nodal loads ±wL/2, ±wL²/12), supports restrain the deflection of every
 * node, rotations free; the rotations are solved by mathjs `lusolve`, then each element's end
 * shears give the reactions. For uniform load the consistent-load element is exact at the nodes
 * (direct stiffness method, any structural-analysis textbook).
 */
function stiffnessReactions(spans: number[], w: number[]): number[] {
  const n = spans.length;
  const size = n + 1; // one rotation per support
  const K = Array.from({ length: size }, () => new Array<number>(size).fill(0));
  const F = new Array<number>(size).fill(0);
  spans.forEach((L, e) => {
    const EI = 1;
    K[e][e] += (4 * EI) / L;
    K[e][e + 1] += (2 * EI) / L;
    K[e + 1][e] += (2 * EI) / L;
    K[e + 1][e + 1] += (4 * EI) / L;
    // Equivalent nodal moments of a downward UDL (counter-clockwise positive): −wL²/12 at the left
    // node, +wL²/12 at the right.
    F[e] -= (w[e] * L * L) / 12;
    F[e + 1] += (w[e] * L * L) / 12;
  });
  const theta = (lusolve(matrix(K), matrix(F.map((f) => [f]))) as Matrix).toArray().map((row) => (row as number[])[0]);
  const reactions = new Array<number>(size).fill(0);
  spans.forEach((L, e) => {
    const EI = 1;
    // End shear forces (upward on the element) = fixed-end shears + stiffness × rotations.
    const vLeft = (w[e] * L) / 2 + ((6 * EI) / (L * L)) * (theta[e] + theta[e + 1]);
    const vRight = (w[e] * L) / 2 - ((6 * EI) / (L * L)) * (theta[e] + theta[e + 1]);
    reactions[e] += vLeft;
    reactions[e + 1] += vRight;
  });
  return reactions;
}

function equal(n: number, L = 1, w = 1) {
  return continuousBeamSolve(new Array(n).fill(L), new Array(n).fill(w));
}

describe('continuousBeamSolve, equal spans, all spans loaded', () => {
  // Hicks, Civil Engineering Formulas, Table 2.1 "Uniformly loaded continuous beams over equal
  // spans": reactions as fractions of wL, support moments as fractions of wL². The AISC Manual
  // beam-diagram tables (Table 3-23) give the same coefficients (from memory).
  const table: Array<{ n: number; reactions: number[]; moments: number[] }> = [
    { n: 2, reactions: [3 / 8, 5 / 4, 3 / 8], moments: [0, -1 / 8, 0] },
    { n: 3, reactions: [2 / 5, 11 / 10, 11 / 10, 2 / 5], moments: [0, -1 / 10, -1 / 10, 0] },
    { n: 4, reactions: [11 / 28, 8 / 7, 13 / 14, 8 / 7, 11 / 28], moments: [0, -3 / 28, -1 / 14, -3 / 28, 0] },
    {
      n: 5,
      reactions: [15 / 38, 43 / 38, 37 / 38, 37 / 38, 43 / 38, 15 / 38],
      moments: [0, -2 / 19, -3 / 38, -3 / 38, -2 / 19, 0],
    },
  ];
  for (const row of table) {
    it(`when ${row.n} equal spans carry w, then the reactions and support moments are Hicks' fractions of wL and wL²`, () => {
      const w = 4.5;
      const L = 4;
      const result = equal(row.n, L, w);
      result.reactions.forEach((r, i) => expect(r).toBeCloseTo(row.reactions[i] * w * L, 10));
      result.supportMoments.forEach((m, i) => expect(m).toBeCloseTo(row.moments[i] * w * L * L, 10));
      const total = result.reactions.reduce((a, b) => a + b, 0);
      expect(total).toBeCloseTo(row.n * w * L, 10);
    });
  }

  it('when 2 to 5 equal spans carry w, then the span moments are the tabulated 0.0703, 0.080/0.025, 0.0772/0.0364, 0.0779/0.0332/0.0461 wL²', () => {
    // Hicks, Civil Engineering Formulas, Table 2.1 (maximum positive moments per span, × wL²).
    expect(equal(2).spanMaxMoments[0].moment).toBeCloseTo(0.0703, 4);
    expect(equal(3).spanMaxMoments.map((s) => s.moment)).toEqual([
      expect.closeTo(0.08, 4),
      expect.closeTo(0.025, 4),
      expect.closeTo(0.08, 4),
    ]);
    const four = equal(4).spanMaxMoments.map((s) => s.moment);
    expect(four[0]).toBeCloseTo(0.0772, 4);
    expect(four[1]).toBeCloseTo(0.0364, 4);
    const five = equal(5).spanMaxMoments.map((s) => s.moment);
    expect(five[0]).toBeCloseTo(0.0779, 4);
    expect(five[1]).toBeCloseTo(0.0332, 4);
    expect(five[2]).toBeCloseTo(0.0461, 4);
    // Where the end-span moment occurs: x = 3L/8 for 2 spans, 0.4L for 3 spans (same table).
    expect(equal(2).spanMaxMoments[0].x).toBeCloseTo(3 / 8, 12);
    expect(equal(3).spanMaxMoments[0].x).toBeCloseTo(0.4, 12);
  });

  it('when 5 equal spans carry w, then the span shears are 15/38, 23/38 (end) and 20/38, 18/38 (second span) of wL', () => {
    // Hicks, Civil Engineering Formulas, Table 2.1 (shears × wL).
    const { spanShears } = equal(5);
    expect(spanShears[0].left).toBeCloseTo(15 / 38, 12);
    expect(spanShears[0].right).toBeCloseTo(-23 / 38, 12);
    expect(spanShears[1].left).toBeCloseTo(20 / 38, 12);
    expect(spanShears[1].right).toBeCloseTo(-18 / 38, 12);
    expect(spanShears[2].left).toBeCloseTo(19 / 38, 12);
  });

  it('when one span is given, then the beam is simply supported: wL/2 each end, wL²/8 at mid-span', () => {
    // Simply supported beam under uniform load (closed form, any statics textbook).
    const result = continuousBeamSolve([6], [2]);
    expect(result.reactions).toEqual([6, 6]);
    expect(result.supportMoments).toEqual([0, 0]);
    expect(result.spanMaxMoments[0].x).toBeCloseTo(3, 12);
    expect(result.spanMaxMoments[0].moment).toBeCloseTo((2 * 36) / 8, 12);
  });
});

describe('continuousBeamSolve, unequal spans and unequal loads', () => {
  it('when two unequal spans carry w, then M_B = −w(L1³ + L2³)/(8(L1 + L2)) and the reactions follow by statics', () => {
    // Closed form for a two-span beam under uniform load (three-moment equation with M_A = M_C = 0).
    const [L1, L2, w] = [3, 5, 2];
    const mB = (-w * (L1 ** 3 + L2 ** 3)) / (8 * (L1 + L2));
    const result = continuousBeamSolve([L1, L2], [w, w]);
    expect(result.supportMoments[1]).toBeCloseTo(mB, 12);
    expect(result.reactions[0]).toBeCloseTo((w * L1) / 2 + mB / L1, 12);
    expect(result.reactions[2]).toBeCloseTo((w * L2) / 2 + mB / L2, 12);
    expect(result.reactions.reduce((a, b) => a + b, 0)).toBeCloseTo(w * (L1 + L2), 12);
  });

  it('when spans and loads are unequal, then the reactions match a stiffness solve by mathjs', () => {
    const spans = [4.5, 3.0, 6.0, 4.5, 2.0, 5.25];
    const w = [1.2, 3.4, 2.0, 0.5, 4.0, 2.2];
    const result = continuousBeamSolve(spans, w);
    const reference = stiffnessReactions(spans, w);
    result.reactions.forEach((r, i) => expect(r).toBeCloseTo(reference[i], 9));
    const total = spans.reduce((sum, L, i) => sum + w[i] * L, 0);
    expect(result.reactions.reduce((a, b) => a + b, 0)).toBeCloseTo(total, 10);
  });

  it('when 40 random beams are solved, then every reaction agrees with the mathjs stiffness solve', () => {
    let seed = 12345;
    const random = () => {
      seed = (seed * 1103515245 + 12345) % 2147483648;
      return seed / 2147483648;
    };
    for (let trial = 0; trial < 40; trial++) {
      const n = 1 + Math.floor(random() * 12);
      const spans = Array.from({ length: n }, () => 0.5 + random() * 9);
      const w = Array.from({ length: n }, () => -2 + random() * 10);
      const result = continuousBeamSolve(spans, w);
      const reference = stiffnessReactions(spans, w);
      result.reactions.forEach((r, i) => expect(r).toBeCloseTo(reference[i], 8));
    }
  });

  it('when only one of two equal spans is loaded, then the far support is pulled down by wL/16', () => {
    // Two-span beam, uniform load on one span: R = 7/16, 5/8, −1/16 of wL (classic beam-diagram
    // case, from memory); also equal to the stiffness solve above.
    const result = continuousBeamSolve([1, 1], [1, 0]);
    expect(result.reactions[0]).toBeCloseTo(7 / 16, 12);
    expect(result.reactions[1]).toBeCloseTo(5 / 8, 12);
    expect(result.reactions[2]).toBeCloseTo(-1 / 16, 12);
    expect(result.supportMoments[1]).toBeCloseTo(-1 / 16, 12);
  });
});

describe('continuousBeamTributary', () => {
  it('when spans are given, then each support takes half of each adjacent span', () => {
    // Tributary-length rule (common practice, no source).
    expect(continuousBeamTributary([4, 4, 4], [4.5, 4.5, 4.5])).toEqual([9, 18, 18, 9]);
    expect(continuousBeamTributary([3, 5], [2, 1])).toEqual([3, 5.5, 2.5]);
  });

  it('when 5 equal spans of 4 m carry 4.5 kN/m, then tributary and exact reactions differ by +26.7 %, −11.6 %, +2.7 %', () => {
    // Exact: Hicks Table 2.1 fractions 15/38, 43/38, 37/38 × wL (wL = 18 kN); tributary 1/2, 1, 1 × wL.
    const spans = [4, 4, 4, 4, 4];
    const w = [4.5, 4.5, 4.5, 4.5, 4.5];
    const exact = continuousBeamSolve(spans, w).reactions;
    const approx = continuousBeamTributary(spans, w);
    const diff = approx.map((a, i) => (a - exact[i]) / exact[i]);
    expect(exact[0]).toBeCloseTo((15 / 38) * 18, 10);
    expect(diff[0]).toBeCloseTo(4 / 15, 10);
    expect(diff[1]).toBeCloseTo(-5 / 43, 10);
    expect(diff[2]).toBeCloseTo(1 / 37, 10);
  });
});

describe('bad input', () => {
  const cases: Array<[string, () => unknown, string]> = [
    ['no spans', () => continuousBeamSolve([], []), 'no-spans'],
    ['a zero span', () => continuousBeamSolve([3, 0], [1, 1]), 'span-not-positive'],
    ['a negative span', () => continuousBeamTributary([-3], [1]), 'span-not-positive'],
    ['a NaN load', () => continuousBeamSolve([3, 3], [1, Number.NaN]), 'non-finite-value'],
    ['an infinite span', () => continuousBeamSolve([Infinity], [1]), 'non-finite-value'],
    ['one load short', () => continuousBeamSolve([3, 3], [1]), 'load-count-mismatch'],
  ];
  for (const [label, run, code] of cases) {
    it(`when the beam has ${label}, then a TakeoffError '${code}' is thrown`, () => {
      expect(run).toThrowError(TakeoffError);
      try {
        run();
      } catch (error) {
        expect((error as TakeoffError).code).toBe(code);
      }
    });
  }

  it('when a span is bad, then the message names the span', () => {
    expect(() => continuousBeamSolve([3, 0, 3], [1, 1, 1])).toThrowError(/Span 2/);
  });
});

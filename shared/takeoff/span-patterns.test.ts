import { describe, expect, it } from 'vitest';
import { create, all } from 'mathjs';
import { continuousBeamSolve } from './continuous-beam';
import { governingSpanPattern, spanPatternLabel } from './span-patterns';

const math = create(all);

/**
 * An independent solve of a continuous beam on rigid supports by the stiffness method, with
 * mathjs's LU solver: unknowns are the support rotations; each span is a prismatic beam element
 * (EI = 1) whose end moments are 4θ_i/L + 2θ_j/L plus the fixed-end moments ∓wL²/12 of a uniform
 * load (any structural analysis textbook's slope-deflection equations, from memory). The
 * reactions then come from the statics of each span. Nothing here uses the three-moment
 * equation of the code under test.
 */
function stiffnessReactions(spans: number[], w: number[]): number[] {
  const n = spans.length;
  const size = n + 1;
  const K: number[][] = Array.from({ length: size }, () => new Array<number>(size).fill(0));
  const F: number[] = new Array<number>(size).fill(0);
  spans.forEach((L, e) => {
    const [i, j] = [e, e + 1];
    K[i][i] += 4 / L;
    K[i][j] += 2 / L;
    K[j][i] += 2 / L;
    K[j][j] += 4 / L;
    // Fixed-end moments (counter-clockwise positive on the member end): +wL²/12 at i, −wL²/12 at j.
    F[i] -= (w[e] * L * L) / 12;
    F[j] += (w[e] * L * L) / 12;
  });
  const theta = (math.lusolve(K, F) as number[][]).map((r) => r[0]);
  const reactions = new Array<number>(size).fill(0);
  spans.forEach((L, e) => {
    const [i, j] = [e, e + 1];
    const mi = (4 * theta[i]) / L + (2 * theta[j]) / L + (w[e] * L * L) / 12;
    const mj = (2 * theta[i]) / L + (4 * theta[j]) / L - (w[e] * L * L) / 12;
    // Span statics, moments about its right end: −V_i·L + wL²/2 + M_i + M_j = 0 (counter-clockwise positive).
    const vi = (w[e] * L) / 2 + (mi + mj) / L;
    reactions[i] += vi;
    reactions[j] += w[e] * L - vi;
  });
  return reactions;
}

/** A small seeded generator (mulberry32) so the random cases repeat. */
function rng(seed: number) {
  let a = seed >>> 0;
  return () => {
    a = (a + 0x6d2b79f5) >>> 0;
    let t = a;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}

describe('span patterns of a continuous purlin: published beam-table values', () => {
  // AISC Steel Construction Manual, Table 3-23 "Shears, moments and deflections", continuous
  // beams of equal spans under uniform load (also Hicks, Civil Engineering Formulas, Table 2.1):
  // from memory.
  it('when one of two equal spans is loaded, then the end reaction of the loaded span is 7/16 wL = 0.4375 wL and that is its governing pattern', () => {
    const L = 4.5;
    const one = continuousBeamSolve([L, L], [1, 0]);
    expect(one.reactions[0]).toBeCloseTo((7 / 16) * L, 12);
    const governing = governingSpanPattern([L, L], 0);
    expect(governing.loaded).toEqual([true, false]);
    expect(governing.label).toBe('span 1 loaded');
    expect(governing.exactPerUnit).toBeCloseTo(0.4375 * L, 12);
    // Against all spans loaded, 3/8 wL (same table): the pattern raises it by 1/6.
    expect(continuousBeamSolve([L, L], [1, 1]).reactions[0]).toBeCloseTo(0.375 * L, 12);
  });

  it('when both of two equal spans are loaded, then the interior reaction is 1.25 wL, which is also its governing pattern', () => {
    const L = 3.7;
    const governing = governingSpanPattern([L, L], 1);
    expect(governing.loaded).toEqual([true, true]);
    expect(governing.label).toBe('all 2 spans loaded');
    expect(governing.exactPerUnit).toBeCloseTo(1.25 * L, 12);
  });

  it('when three equal spans have the two spans either side of an interior support loaded, then that reaction is 1.2 wL, the governing pattern', () => {
    const L = 6;
    const loadedTwo = continuousBeamSolve([L, L, L], [1, 1, 0]);
    expect(loadedTwo.reactions[1]).toBeCloseTo(1.2 * L, 12);
    const governing = governingSpanPattern([L, L, L], 1);
    expect(governing.loaded).toEqual([true, true, false]);
    expect(governing.label).toBe('spans 1 and 2 loaded');
    expect(governing.exactPerUnit).toBeCloseTo(1.2 * L, 12);
    // All three loaded gives 1.1 wL (same table): the pattern governs.
    expect(continuousBeamSolve([L, L, L], [1, 1, 1]).reactions[1]).toBeCloseTo(1.1 * L, 12);
    // Tributary length under the pattern: half of each loaded adjacent span (common practice, no source).
    expect(governing.tributaryPerUnit).toBeCloseTo(L, 12);
  });

  it('when the pattern is named, then the words list the loaded spans counted from 1', () => {
    expect(spanPatternLabel([false, true, true, false])).toBe('spans 2 and 3 loaded');
    expect(spanPatternLabel([true, false, true, false, true])).toBe('spans 1, 3 and 5 loaded');
    expect(spanPatternLabel([true, true, true])).toBe('all 3 spans loaded');
    expect(spanPatternLabel([false, false, true])).toBe('span 3 loaded');
  });
});

describe('span patterns against every pattern, solved independently', () => {
  it('when 2 to 8 spans of random lengths are tried on every truss, then the governing reaction equals the largest over all 2^n patterns by a mathjs stiffness solve', () => {
    const random = rng(20261203);
    let compared = 0;
    for (let trial = 0; trial < 14; trial++) {
      const n = 2 + (trial % 7);
      const spans = Array.from({ length: n }, () => 2 + 5 * random());
      for (let k = 0; k <= n; k++) {
        let best = -Infinity;
        let bestMask = -1;
        for (let mask = 1; mask < 1 << n; mask++) {
          const w = spans.map((_, j) => ((mask >> j) & 1 ? 1 : 0));
          const r = stiffnessReactions(spans, w)[k];
          if (r > best) {
            best = r;
            bestMask = mask;
          }
        }
        const governing = governingSpanPattern(spans, k);
        expect(governing.exactPerUnit).toBeCloseTo(best, 9);
        expect(governing.loaded).toEqual(spans.map((_, j) => Boolean((bestMask >> j) & 1)));
        compared++;
      }
    }
    expect(compared).toBeGreaterThan(80);
  });

  it('when random span patterns are loaded, then the three-moment reactions agree with the mathjs stiffness solve', () => {
    const random = rng(7);
    for (let trial = 0; trial < 50; trial++) {
      const n = 1 + Math.floor(random() * 9);
      const spans = Array.from({ length: n }, () => 1.5 + 6 * random());
      const w = spans.map(() => (random() < 0.5 ? 0 : 0.5 + 3 * random()));
      const mine = continuousBeamSolve(spans, w).reactions;
      const theirs = stiffnessReactions(spans, w);
      mine.forEach((r, i) => expect(r).toBeCloseTo(theirs[i], 9));
    }
  });

  it('when many spans are checked (10 spans, five trusses), then the superposition pattern still matches the brute force over 1023 patterns', () => {
    const spans = [4.5, 4.5, 6, 3.9, 4.5, 4.5, 5.2, 4.5, 4.1, 4.5];
    for (const k of [0, 1, 5, 9, 10]) {
      let best = -Infinity;
      for (let mask = 1; mask < 1 << spans.length; mask++) {
        const r = stiffnessReactions(spans, spans.map((_, j) => ((mask >> j) & 1 ? 1 : 0)))[k];
        if (r > best) best = r;
      }
      expect(governingSpanPattern(spans, k).exactPerUnit).toBeCloseTo(best, 9);
    }
  });

  it('when uplift governs (direction −1), then the pattern loads the spans that lift the truss and the reaction is the least over all patterns', () => {
    const spans = [4, 5, 4];
    let least = Infinity;
    for (let mask = 1; mask < 8; mask++) least = Math.min(least, stiffnessReactions(spans, spans.map((_, j) => ((mask >> j) & 1 ? 1 : 0)))[0]);
    const governing = governingSpanPattern(spans, 0, -1);
    expect(governing.exactPerUnit).toBeCloseTo(least, 9);
    expect(governing.loaded).toEqual([false, true, false]);
  });
});

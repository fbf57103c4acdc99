import { continuousBeamSolve } from './continuous-beam';

/**
 * Unfavourable span patterns of a continuous purlin (partial loading of roof live and snow load).
 *
 * Clauses: ASCE/SEI 7-16 §4.3.3 (partial loading: the full intensity applied to only a portion
 * of a member, where that is more unfavourable than the full member loaded) and §7.5 (partial
 * snow loading of continuous members, with the three loadings of §7.5.1 for continuous beams).
 *
 * Method. The purlin is linear, so the reaction on truss k under any pattern of loaded spans is
 * the sum of the reactions r_j of each loaded span loaded alone (superposition); each r_j is a
 * three-moment-equation solve with only span j loaded. The pattern that gives the largest
 * downward reaction out of all 2^n loaded/unloaded patterns is therefore exactly "load the spans
 * whose r_j is positive" — found without listing the 2^n patterns, for any number of spans.
 * It is the maximum over every pattern, so it is at least every pattern §7.5.1 lists.
 *
 * Unloaded spans carry no load. §7.5 puts half the balanced snow load on the other spans; a
 * span left out lowers the reaction only where its r_j is negative, so taking it as empty gives
 * a reaction no smaller than the half-load one (the conservative reading).
 */

/** The governing span pattern of one reaction. */
export interface SpanPattern {
  /** Which spans are loaded (length n, span 0 = between trusses 0 and 1). */
  loaded: boolean[];
  /** m: reaction on the truss per 1 kN/m on span j alone, j = 0 … n − 1 (three-moment equation). */
  contributions: number[];
  /** m: reaction per 1 kN/m on the loaded spans, three-moment equation (= sum of the loaded contributions). */
  exactPerUnit: number;
  /** m: the same by tributary length (half of each loaded span next to the truss). */
  tributaryPerUnit: number;
  /** m² per 1 kN/m: support moments under the governing pattern (sagging positive). */
  momentsPerUnit: number[];
  /** In words, e.g. "spans 2 and 3 loaded" (spans counted from 1). */
  label: string;
}

/** "span 2", "spans 2 and 3", "spans 1, 3 and 5", "all 4 spans" — counted from 1. */
export function spanPatternLabel(loaded: readonly boolean[]): string {
  const on = loaded.flatMap((l, i) => (l ? [i + 1] : []));
  if (on.length === 0) return 'no span loaded';
  if (on.length === loaded.length) return loaded.length === 1 ? 'the one span loaded' : `all ${loaded.length} spans loaded`;
  if (on.length === 1) return `span ${on[0]} loaded`;
  return `spans ${on.slice(0, -1).join(', ')} and ${on[on.length - 1]} loaded`;
}

/**
 * The governing pattern for the reaction on truss `trussIndex` under a line load of sign
 * `direction` (+1 downward, as snow and roof live load; −1 picks the largest uplift instead).
 * Ties (a span with r_j = 0) leave that span unloaded.
 *
 * @param spans span lengths, m (the truss spacings)
 */
export function governingSpanPattern(spans: readonly number[], trussIndex: number, direction: 1 | -1 = 1): SpanPattern {
  const n = spans.length;
  const contributions = spans.map((_, j) => {
    const w = new Array<number>(n).fill(0);
    w[j] = 1;
    return continuousBeamSolve([...spans], w).reactions[trussIndex];
  });
  const loaded = contributions.map((r) => direction * r > 0);
  // A load that pushes nowhere the wanted way (cannot happen for n ≥ 1 and a real truss) keeps the full load.
  if (!loaded.some(Boolean)) loaded.fill(true);
  const w = loaded.map((l) => (l ? 1 : 0));
  const beam = continuousBeamSolve([...spans], w);
  const left = trussIndex > 0 && loaded[trussIndex - 1] ? spans[trussIndex - 1] / 2 : 0;
  const right = trussIndex < n && loaded[trussIndex] ? spans[trussIndex] / 2 : 0;
  return {
    loaded,
    contributions,
    exactPerUnit: beam.reactions[trussIndex],
    tributaryPerUnit: left + right,
    momentsPerUnit: beam.supportMoments,
    label: spanPatternLabel(loaded),
  };
}

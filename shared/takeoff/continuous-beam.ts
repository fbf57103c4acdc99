import { TakeoffError } from './errors';

/**
 * A continuous beam on knife-edge supports at both ends and between spans (a purlin over
 * trusses), uniform load per span, EI constant, supports at one level.
 *
 * Units and signs:
 * - span lengths in m, line loads w in kN/m, positive downward (gravity);
 * - reactions in kN, positive upward;
 * - moments in kN·m, sagging positive (support moments over interior supports are negative
 *   under downward load);
 * - span shear V(x) in kN with the beam convention V = dM/dx: under downward load the shear at
 *   the left end of a span is positive and at the right end negative.
 */
export interface ContinuousBeamResult {
  /** m, as given. */
  spans: number[];
  /** kN/m per span, as given (downward positive). */
  w: number[];
  /** kN·m at each support, left to right (length spans + 1); both ends are 0. */
  supportMoments: number[];
  /** kN at each support, upward positive (length spans + 1). */
  reactions: number[];
  /** kN per span: V just right of its left support and just left of its right support. */
  spanShears: { left: number; right: number }[];
  /**
   * Per span, the largest sagging moment inside the span (kN·m) and where it occurs (m from the
   * span's left support); when no point of the span sags, the least hogging value.
   */
  spanMaxMoments: { x: number; moment: number }[];
}

function assertBeamInput(spans: number[], w: number[]): void {
  if (!Array.isArray(spans) || spans.length < 1) {
    throw new TakeoffError('no-spans', 'A continuous beam needs at least one span; the list of spans is empty.');
  }
  if (!Array.isArray(w) || w.length !== spans.length) {
    throw new TakeoffError(
      'load-count-mismatch',
      `Give one line load per span: ${spans.length} span(s) but ${Array.isArray(w) ? w.length : 0} load(s).`,
    );
  }
  spans.forEach((length, i) => {
    if (!Number.isFinite(length)) {
      throw new TakeoffError('non-finite-value', `Span ${i + 1} has length ${length}; enter a finite length in m.`);
    }
    if (length <= 0) {
      throw new TakeoffError('span-not-positive', `Span ${i + 1} has length ${length} m; every span must be longer than 0 m.`);
    }
  });
  w.forEach((load, i) => {
    if (!Number.isFinite(load)) {
      throw new TakeoffError('non-finite-value', `The line load on span ${i + 1} is ${load}; enter a finite load in kN/m.`);
    }
  });
}

/**
 * Support moments of a continuous beam by the three-moment equation (Clapeyron), exact for
 * any number of spans (≥ 1) of any lengths. With M_0 = M_n = 0 (simply supported ends), for
 * each interior support i between span L_i (left) and L_{i+1} (right):
 *
 *   L_i·M_{i−1} + 2(L_i + L_{i+1})·M_i + L_{i+1}·M_{i+1} = −(w_i·L_i³ + w_{i+1}·L_{i+1}³)/4
 *
 * The tridiagonal system is strictly diagonally dominant, so it is solved directly (Thomas
 * algorithm) in O(n) without pivoting.
 */
function supportMomentsSolve(spans: number[], w: number[]): number[] {
  const n = spans.length;
  const moments = new Array<number>(n + 1).fill(0);
  const unknowns = n - 1;
  if (unknowns === 0) return moments;
  const sub = new Array<number>(unknowns);
  const diag = new Array<number>(unknowns);
  const sup = new Array<number>(unknowns);
  const rhs = new Array<number>(unknowns);
  for (let k = 0; k < unknowns; k++) {
    const left = spans[k];
    const right = spans[k + 1];
    sub[k] = left;
    diag[k] = 2 * (left + right);
    sup[k] = right;
    rhs[k] = -(w[k] * left ** 3 + w[k + 1] * right ** 3) / 4;
  }
  // Forward sweep.
  for (let k = 1; k < unknowns; k++) {
    const m = sub[k] / diag[k - 1];
    diag[k] -= m * sup[k - 1];
    rhs[k] -= m * rhs[k - 1];
  }
  // Back substitution (unknown k is the moment at support k + 1).
  moments[unknowns] = rhs[unknowns - 1] / diag[unknowns - 1];
  for (let k = unknowns - 2; k >= 0; k--) {
    moments[k + 1] = (rhs[k] - sup[k] * moments[k + 2]) / diag[k];
  }
  return moments;
}

/**
 * Solves a continuous beam under a uniform load on each span: support moments by the
 * three-moment equation, then span shears and support reactions by statics of each span.
 * A single span is simply supported (reactions wL/2).
 *
 * @param spans span lengths, m, left to right (≥ 1 span, each > 0; unequal spans allowed)
 * @param w line load on each span, kN/m, downward positive (negative for uplift)
 * @throws TakeoffError 'no-spans', 'load-count-mismatch', 'span-not-positive', 'non-finite-value'
 */
export function continuousBeamSolve(spans: number[], w: number[]): ContinuousBeamResult {
  assertBeamInput(spans, w);
  const n = spans.length;
  const supportMoments = supportMomentsSolve(spans, w);
  const reactions = new Array<number>(n + 1).fill(0);
  const spanShears: { left: number; right: number }[] = [];
  const spanMaxMoments: { x: number; moment: number }[] = [];
  for (let k = 0; k < n; k++) {
    const L = spans[k];
    const q = w[k];
    const mLeft = supportMoments[k];
    const mRight = supportMoments[k + 1];
    const left = (q * L) / 2 + (mRight - mLeft) / L;
    const right = left - q * L;
    spanShears.push({ left, right });
    reactions[k] += left;
    reactions[k + 1] -= right;

    // M(x) = mLeft + left·x − q·x²/2; its stationary point is where V = 0.
    const momentAt = (x: number) => mLeft + left * x - (q * x * x) / 2;
    let best = { x: 0, moment: mLeft };
    if (mRight > best.moment) best = { x: L, moment: mRight };
    if (q !== 0) {
      const x0 = left / q;
      if (x0 > 0 && x0 < L && momentAt(x0) > best.moment) best = { x: x0, moment: momentAt(x0) };
    }
    spanMaxMoments.push(best);
  }
  return {
    spans: [...spans],
    w: [...w],
    supportMoments,
    reactions,
    spanShears,
    spanMaxMoments,
  };
}

/**
 * The tributary-length approximation of the support reactions of a continuous beam: each
 * support takes half of each adjacent span's load, R_i = (w_{i−1}·L_{i−1} + w_i·L_i)/2
 * (common practice, no source). Same units and signs as {@link continuousBeamSolve}.
 *
 * @returns reactions at each support, kN, upward positive (length spans + 1)
 */
export function continuousBeamTributary(spans: number[], w: number[]): number[] {
  assertBeamInput(spans, w);
  const reactions = new Array<number>(spans.length + 1).fill(0);
  spans.forEach((L, k) => {
    const half = (w[k] * L) / 2;
    reactions[k] += half;
    reactions[k + 1] += half;
  });
  return reactions;
}

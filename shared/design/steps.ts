/** One line of a design check, written like the joint steps: formula, numbers, result, clause. */
export interface DesignStep {
  clause: string;
  title: string;
  /** The formula in symbols (plain text with Unicode). */
  formula: string;
  /** The same formula with the numbers put in. */
  substituted: string;
  /** The result with its unit. */
  result: string;
  /** The result as a number (unit as in `result`), for tests and tables. */
  value: number;
}

/** Five significant figures, trailing zeros kept off: 621, 413.17, 0.43695. */
export function num(x: number, sig = 5): string {
  if (!Number.isFinite(x)) return String(x);
  if (x === 0) return '0';
  const s = Number(x.toPrecision(sig));
  return Math.abs(s) >= 1e6 ? s.toExponential(sig - 1) : String(s);
}

/** Half a unit of the last place a number is printed to ("621" → 0.5, "0.437" → 0.0005). */
export function printedHalf(text: string): number {
  const m = /\.(\d+)/.exec(text);
  return 0.5 * 10 ** -(m ? m[1].length : 0);
}

/** The most significant figures an operand is given so that its step multiplies out. */
export const MAX_OPERAND_SIG = 12;

/**
 * Significant figures for a step's operands such that the step, redone by hand from the printed
 * operands, gives the printed result back within half a unit of its last printed place (the rule
 * the joint steps follow, shared/solver/printed-digits.ts): the fewest from `base` up.
 * `redo` gets the operands as printed (numbers read back from their text).
 */
export function operandSig(ops: number[], redo: (printed: number[]) => number, resultText: string, base = 5): number {
  const shown = Number(resultText);
  const half = printedHalf(resultText);
  for (let sig = base; sig <= MAX_OPERAND_SIG; sig++) {
    const got = redo(ops.map((o) => Number(num(o, sig))));
    if (Number.isFinite(got) && Math.abs(got - shown) <= half * (1 + 1e-9) + 1e-12) return sig;
  }
  return MAX_OPERAND_SIG;
}

/**
 * A step whose numbers carry: `ops` printed with {@link operandSig} figures into `text`, the
 * result `value` printed to `sig` figures (and `unit`).
 */
export function carriedStep(o: {
  clause: string;
  title: string;
  formula: string;
  ops: number[];
  text: (printed: string[]) => string;
  redo: (printed: number[]) => number;
  value: number;
  unit?: string;
  sig?: number;
}): DesignStep {
  const r = num(o.value, o.sig ?? 5);
  const s = operandSig(o.ops, o.redo, r);
  return { clause: o.clause, title: o.title, formula: o.formula, substituted: o.text(o.ops.map((x) => num(x, s))), result: o.unit ? `${r} ${o.unit}` : r, value: o.value };
}

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

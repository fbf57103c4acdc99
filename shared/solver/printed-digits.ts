import type { EquilibriumEquation, ReactionStep, SolverStep } from './types';

/**
 * How many decimals a step's operands are printed with, so that a checker who redoes the step
 * by hand from the printed numbers gets the printed result back to its printed precision.
 *
 * Results (forces, reactions) keep the sheet's fixed decimals. The operands — direction cosines,
 * lever arms, known forces substituted into an equation, lengths, stiffnesses, elongations — are
 * printed with as many extra decimals as needed (none when the printed ones already carry, which
 * is the usual case for simple geometry): intermediate values shown to more places than results,
 * the ordinary practice of hand calculation (common practice, no source).
 *
 * "Gets the result back" means: redone from the printed operands, the result lies within half a
 * unit of the printed result's last place, so rounding it gives the printed digits.
 */

/** The most extra decimals an operand is given; past this the step keeps this precision. */
export const MAX_EXTRA_DECIMALS = 6;

/** Decimals for each kind of printed number in a step. */
export interface StepDigits {
  /** Results: solved forces and reactions, kN. */
  result: number;
  /** Coefficients (cosines, lever arms) and known values substituted. */
  operand: number;
}

/** The number as printed with `d` decimals (the same rounding as the sheet: `toFixed`). */
export function printedValue(x: number, d: number): number {
  return Number(x.toFixed(d));
}

/** True when `got`, redone from printed operands, rounds back to `value` printed with `d` decimals. */
export function carries(got: number, value: number, d: number): boolean {
  const shown = printedValue(value, d);
  return Number.isFinite(got) && Math.abs(got - shown) <= 0.5 * 10 ** -d * (1 + 1e-9) + 1e-12;
}

/** Smallest extra decimals (0…MAX_EXTRA_DECIMALS) for which `ok(operandDecimals)` holds. */
export function carryDecimals(base: number, ok: (operandDecimals: number) => boolean): number {
  for (let extra = 0; extra <= MAX_EXTRA_DECIMALS; extra++) {
    if (ok(base + extra)) return base + extra;
  }
  return base + MAX_EXTRA_DECIMALS;
}

/**
 * An equation as the sheet prints it, read back: the printed coefficient of each unknown and the
 * printed constant (Σ printed coefficient × printed value over the known terms). Terms the sheet
 * leaves out (zero coefficient, zero value) are left out here too; a coefficient of exactly ±1 is
 * not printed, so it is exact.
 */
export function printedLinear(eq: EquilibriumEquation, operand: number): { unknowns: Map<string, number>; constant: number } {
  const unknowns = new Map<string, number>();
  let constant = 0;
  for (const t of eq.terms) {
    if (Math.abs(t.coefficient) < 1e-12) continue;
    if (t.value !== null && t.value === 0) continue;
    const mag = Math.abs(t.coefficient);
    const c = Math.sign(t.coefficient) * (Math.abs(mag - 1) < 1e-12 ? 1 : printedValue(mag, operand));
    if (t.value === null) unknowns.set(t.symbol, (unknowns.get(t.symbol) ?? 0) + c);
    else constant += c * printedValue(t.value, operand);
  }
  return { unknowns, constant };
}

/**
 * Solves the printed equations for the named unknowns (Gaussian elimination with partial
 * pivoting; least squares when there are more equations than unknowns). Null when singular.
 */
export function printedSolve(equations: EquilibriumEquation[], symbols: string[], operand: number): number[] | null {
  const rows = equations.map((eq) => printedLinear(eq, operand));
  let a = rows.map((r) => symbols.map((s) => r.unknowns.get(s) ?? 0));
  let b = rows.map((r) => -r.constant);
  const n = symbols.length;
  if (a.length > n) {
    // Normal equations: AᵀA x = Aᵀb.
    const at = symbols.map((_, i) => a.map((row) => row[i]));
    const ata = at.map((ri) => at.map((rj) => ri.reduce((s, v, k) => s + v * rj[k], 0)));
    const atb = at.map((ri) => ri.reduce((s, v, k) => s + v * b[k], 0));
    a = ata;
    b = atb;
  }
  if (a.length !== n) return null;
  const m = a.map((row, i) => [...row, b[i]]);
  for (let c = 0; c < n; c++) {
    let best = c;
    for (let r = c + 1; r < n; r++) if (Math.abs(m[r][c]) > Math.abs(m[best][c])) best = r;
    if (Math.abs(m[best][c]) < 1e-12) return null;
    [m[c], m[best]] = [m[best], m[c]];
    for (let r = 0; r < n; r++) {
      if (r === c) continue;
      const f = m[r][c] / m[c][c];
      if (f !== 0) for (let k = c; k <= n; k++) m[r][k] -= f * m[c][k];
    }
  }
  return m.map((row, i) => row[n] / row[i]);
}

function solvesCarry(equations: EquilibriumEquation[], solution: { symbol: string; value: number }[], digits: number, operand: number): boolean {
  const got = printedSolve(equations, solution.map((s) => s.symbol), operand);
  return got !== null && got.every((g, i) => carries(g, solution[i].value, digits));
}

/**
 * Operand decimals for each step of a case (by step id). Reaction steps are taken together as an
 * engineer reads them: the equations since the last reaction found, up to the one that finds the
 * next, are the ones to redo.
 */
export function stepsOperandDecimals(steps: SolverStep[], result = 3): Map<string, number> {
  const out = new Map<string, number>();
  let pending: ReactionStep[] = [];
  for (const step of steps) {
    if (step.kind === 'reaction') {
      pending.push(step);
      if (step.solves.length === 0) continue;
      const group = pending;
      pending = [];
      const eqs = group.map((s) => s.equation);
      const d = carryDecimals(result, (op) => solvesCarry(eqs, step.solves, result, op));
      for (const s of group) out.set(s.id, d);
      continue;
    }
    out.set(step.id, stepOperandDecimals(step, result));
  }
  for (const s of pending) out.set(s.id, result);
  return out;
}

/** Operand decimals for one step on its own (reaction steps: its own equation only). */
export function stepOperandDecimals(step: SolverStep, result = 3): number {
  switch (step.kind) {
    case 'reaction':
      return step.solves.length ? carryDecimals(result, (op) => solvesCarry([step.equation], step.solves, result, op)) : result;
    case 'joint': {
      const used = step.solvedFrom === 'both' ? step.equations : step.equations.filter((e) => e.kind === step.solvedFrom);
      return carryDecimals(result, (op) => solvesCarry(used, step.solution, result, op));
    }
    case 'simultaneous':
      return carryDecimals(result, (op) => solvesCarry(step.equations, step.solution, result, op));
    case 'stiffness-members':
      // k = EA / L: EA (kN) printed whole, or with the extra decimals when it needs them; L to the
      // operand decimals; k to one decimal (kN/m).
      return carryDecimals(result, (op) =>
        step.rows.every((r) => carries(printedValue(r.EA, Math.max(0, op - result)) / printedValue(r.length, op), r.k, 1)),
      );
    case 'stiffness-forces':
      // N = k δ: k (kN/m) and δ (mm) printed, the product ×10⁻³ against N printed.
      return carryDecimals(result, (op) =>
        step.rows.every((r) => carries(printedValue(r.k, Math.max(1, op - 2)) * printedValue(r.elongation * 1000, op) * 1e-3, r.force, result)),
      );
    default:
      return result;
  }
}

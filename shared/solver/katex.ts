import type {
  EquilibriumEquation,
  ForceSense,
  JointForce,
  SolvedForce,
  SolverStep,
} from './types';
import { texText } from '../text/safe-text';
import { texScientific } from '../units/format';
import { stepOperandDecimals, stepsOperandDecimals } from './printed-digits';

/** Options for `stepToKatex`. */
export interface KatexOptions {
  /** Decimals for results — forces (kN) and coordinates (m); default 3. */
  decimals?: number;
  /**
   * Decimals for operands: cosines, lever arms, known values substituted, lengths, elongations.
   * Default: the fewest (at least `decimals`) with which the step redone from its printed
   * numbers gives its printed results (printed-digits.ts).
   */
  operandDecimals?: number;
}

/** KaTeX symbol of a member force: F_{AB}. */
export function symbolMember(tag: string): string {
  return `F_{${texText(tag)}}`;
}

/** KaTeX symbol of a reaction component at a joint: R_{A,x}, R_{A,y} or R_{A} along a line. */
export function symbolReaction(jointTag: string, component: 'x' | 'y' | 'n'): string {
  const t = texText(jointTag);
  return component === 'n' ? `R_{${t}}` : `R_{${t},${component}}`;
}

/** Letters a joint load may be written with, in order of preference. */
const LOAD_LETTERS = ['P', 'Q', 'W', 'G', 'H'] as const;

/**
 * The letter of the load symbols of a truss: P, unless a tag could be read as that letter — a
 * joint tag starting with it (a joint "P" or "P2" beside the load "P"), or a member tag equal to
 * it — then the next of Q, W, G, H that none does. When all clash, the first no tag equals. The
 * load symbol always carries its joint and axis as a subscript (P_{C,y}) and the sheet's symbols
 * list defines it, so even then it is qualified.
 */
export function loadLetterFor(jointTags: readonly string[], memberTags: readonly string[] = []): string {
  const clashes = (letter: string) =>
    jointTags.some((t) => t.toUpperCase().startsWith(letter)) || memberTags.some((t) => t.toUpperCase() === letter);
  return LOAD_LETTERS.find((l) => !clashes(l)) ?? LOAD_LETTERS.find((l) => !jointTags.some((t) => t.toUpperCase() === l)) ?? 'P';
}

/** The load letter of a model (see {@link loadLetterFor}). */
export function loadLetterOf(model: { joints: readonly { tag: string }[]; members: readonly { tag: string }[] }): string {
  return loadLetterFor(model.joints.map((j) => j.tag), model.members.map((m) => m.tag));
}

/** KaTeX symbol of a load component at a joint: P_{C,x}, P_{C,y} (or the truss's own load letter). */
export function symbolLoad(jointTag: string, component: 'x' | 'y', letter = 'P'): string {
  return `${letter}_{${texText(jointTag)},${component}}`;
}

/** Formats a number with fixed decimals, never "-0.000". */
export function numberFormat(value: number, decimals = 3): string {
  const text = value.toFixed(decimals);
  return /^-0\.?0*$/.test(text) ? text.slice(1) : text;
}

function senseText(sense: ForceSense | undefined): string {
  if (sense === 'T') return '\\ (\\mathrm{T})';
  if (sense === 'C') return '\\ (\\mathrm{C})';
  return '';
}

function termTex(coefficient: number, body: string, d: number, first: boolean, numeric: boolean): string {
  const sign = coefficient < 0 ? '-' : '+';
  const mag = Math.abs(coefficient);
  const coeffText = Math.abs(mag - 1) < 1e-12 ? '' : `${numberFormat(mag, d)}${numeric ? ' \\times ' : '\\,'}`;
  const lead = first ? (sign === '-' ? '-' : '') : ` ${sign} `;
  return `${lead}${coeffText}${body}`;
}

function valueBody(term: { symbol: string; value: number | null }, d: number): string {
  if (term.value === null) return term.symbol;
  const v = numberFormat(term.value, d);
  return term.value < 0 && v.startsWith('-') ? `(${v})` : v;
}

function equationLabel(eq: EquilibriumEquation): string {
  const at = eq.about ? `\\big|_{${texText(eq.about.tag)}}` : '';
  if (eq.kind === 'sum-fx') return `\\Sigma F_x${at} = 0`;
  if (eq.kind === 'sum-fy') return `\\Sigma F_y${at} = 0`;
  const about = eq.about ? `_{${texText(eq.about.tag)}}` : '';
  return `\\Sigma M${about} = 0`;
}

/**
 * One equation as KaTeX, known values substituted:
 * `\Sigma F_x = 0:\quad -0.800\,F_{AC} + 50.000 = 0`. Terms with a zero coefficient are left out.
 */
export function equationToKatex(eq: EquilibriumEquation, options: KatexOptions = {}): string {
  const d = options.operandDecimals ?? options.decimals ?? 3;
  const parts: string[] = [];
  for (const term of eq.terms) {
    if (Math.abs(term.coefficient) < 1e-12) continue;
    if (term.value !== null && term.value === 0) continue;
    parts.push(termTex(term.coefficient, valueBody(term, d), d, parts.length === 0, term.value !== null));
  }
  const body = parts.length ? parts.join('') : '0';
  return `${equationLabel(eq)}:\\quad ${body} = 0`;
}

function solvedToKatex(s: SolvedForce, d: number): string {
  return `${s.symbol} = ${numberFormat(s.value, d)}\\ \\mathrm{kN}${senseText(s.sense)}`;
}

function cosinesToKatex(f: JointForce, d: number): string {
  return `${f.symbol}:\\ (\\cos, \\sin) = (${numberFormat(f.cx, d)},\\ ${numberFormat(f.cy, d)})`;
}

/** A degree of freedom as a typeset symbol: u_{A}, v_{A}, or t_{M} along a roller's line. */
function dofSymbol(f: { label: string; tag: string }): string {
  const letter = /^([uvt])_/.exec(f.label)?.[1] ?? 'u';
  return `${letter}_{${texText(f.tag)}}`;
}

function matrixToKatex(rows: number[][], d: number): string {
  const body = rows.map((r) => r.map((v) => numberFormat(v, d)).join(' & ')).join(' \\\\ ');
  return `\\begin{bmatrix} ${body} \\end{bmatrix}`;
}

/**
 * KaTeX source lines for any solver step, in reading order. Each line is one display equation
 * (the sheet and the client both render from these). Plain words are wrapped in `\text{}`.
 */
export function stepToKatex(step: SolverStep, options: KatexOptions = {}): string[] {
  const d = options.decimals ?? 3;
  const op = options.operandDecimals ?? stepOperandDecimals(step, d);
  const eqOptions: KatexOptions = { decimals: d, operandDecimals: op };
  switch (step.kind) {
    case 'determinacy': {
      const rel = step.degree === 0 ? '=' : step.degree > 0 ? '>' : '<';
      const words =
        step.verdict === 'determinate'
          ? 'statically determinate'
          : step.verdict === 'indeterminate'
            ? `statically indeterminate to degree ${step.degree}`
            : 'unstable';
      return [
        `m + r = ${step.m} + ${step.r} = ${step.m + step.r} \\; ${rel} \\; 2j = 2 \\times ${step.j} = ${2 * step.j}`,
        `\\operatorname{rank} \\mathbf{A} = ${step.rank} ${step.rank === 2 * step.j ? '=' : '<'} 2j = ${2 * step.j}`,
        `\\Rightarrow\\ \\text{${words}}`,
      ];
    }
    case 'zero-force': {
      // Plain words, not rule numbers: what is seen at the joint that makes the member carry nothing.
      const why =
        step.rule === 1
          ? 'two members not in line meet there, with no load and no support'
          : 'three members meet there, two of them in line, with no load and no support';
      const later = step.pass > 1 ? ', once the zero-force members found before are set aside' : '';
      return [
        `${symbolMember(step.memberTag)} = 0 \\quad \\text{(at joint }${texText(step.jointTag)}\\text{: ${why}${later})}`,
      ];
    }
    case 'reaction': {
      const lines = [equationToKatex(step.equation, eqOptions)];
      for (const s of step.solves) lines.push(`\\Rightarrow\\ ${solvedToKatex(s, d)}`);
      return lines;
    }
    case 'joint': {
      const lines = [
        `\\text{Joint }${texText(step.jointTag)}\\text{ at } (${numberFormat(step.x, d)},\\ ${numberFormat(step.y, d)})\\ \\mathrm{m}`,
      ];
      for (const u of step.unknowns) lines.push(cosinesToKatex(u, op));
      for (const eq of step.equations) {
        const used = step.solvedFrom === 'both' || step.solvedFrom === eq.kind;
        lines.push(equationToKatex(eq, eqOptions) + (used ? '' : '\\quad\\text{(check)}'));
      }
      for (const s of step.solution) lines.push(`\\Rightarrow\\ ${solvedToKatex(s, d)}`);
      return lines;
    }
    case 'simultaneous': {
      const lines = [texText(step.reason)];
      for (const eq of step.equations) lines.push(equationToKatex(eq, eqOptions));
      for (const s of step.solution) lines.push(`\\Rightarrow\\ ${solvedToKatex(s, d)}`);
      return lines;
    }
    case 'stiffness-members':
      return step.rows.map(
        (r) =>
          `k_{${texText(r.tag)}} = \\frac{EA}{L} = \\frac{${numberFormat(r.EA, Math.max(0, op - d))}}{${numberFormat(r.length, op)}} = ${numberFormat(r.k, 1)}\\ \\mathrm{kN/m},\\quad (c, s) = (${numberFormat(r.c, op)},\\ ${numberFormat(r.s, op)})`,
      );
    case 'stiffness-assembly': {
      const lines = [
        `\\mathbf{u} = [${step.dofs.map((f) => dofSymbol(f)).join(',\\ ')}]^{T}`,
      ];
      const rollers = step.dofs.filter((f) => f.label.startsWith('t_'));
      if (rollers.length) {
        lines.push(
          `${rollers.map((f) => dofSymbol(f)).join(',\\ ')}:\\ \\text{movement of ${rollers.length === 1 ? 'the roller joint' : 'each roller joint'} along its rolling line; } u, v\\text{: movement of a free joint in } x, y`,
        );
      }
      if (step.matrix) lines.push(`\\mathbf{K} = ${matrixToKatex(step.matrix, 1)}\\ \\mathrm{kN/m}`);
      if (step.note) lines.push(texText(step.note));
      lines.push(`\\mathbf{P} = [${step.loads.map((v) => numberFormat(v, d)).join(',\\ ')}]^{T}\\ \\mathrm{kN}`);
      lines.push('\\mathbf{K}\\,\\mathbf{u} = \\mathbf{P}');
      return lines;
    }
    case 'stiffness-displacements':
      return step.displacements.map(
        (u) =>
          `u_{${texText(u.tag)}} = ${numberFormat(u.ux * 1000, d)}\\ \\mathrm{mm},\\quad v_{${texText(u.tag)}} = ${numberFormat(u.uy * 1000, d)}\\ \\mathrm{mm}`,
      );
    case 'stiffness-forces':
      return step.rows.map(
        (r) =>
          `${symbolMember(r.tag)} = k\\,\\delta = ${numberFormat(r.k, Math.max(1, op - 2))} \\times ${numberFormat(r.elongation * 1000, op)}\\times 10^{-3} = ${numberFormat(r.force, d)}\\ \\mathrm{kN}${senseText(r.sense)}`,
      );
    case 'check': {
      const at = step.residualJointTag ? `\\ \\text{at joint }${texText(step.residualJointTag)}` : '';
      // The ratio is worked from the residual and the load as printed, so it divides out by hand.
      // Both written m × 10ⁿ (texScientific), never the computer's 2.01e-14.
      const residualShown = Number(step.residual.toExponential(2));
      const largestShown = numberFormat(step.largestLoad, d);
      const ratio = Number(largestShown) > 0 ? residualShown / Number(largestShown) : 0;
      return [
        `\\max_{\\text{joints}} \\left|\\Sigma \\mathbf{F}\\right| = ${texScientific(residualShown, 3)}\\ \\mathrm{kN}${at}`,
        `\\text{relative to the largest load } ${largestShown}\\ \\mathrm{kN}:\\ ${texScientific(ratio, 3)}`,
      ];
    }
  }
}

/**
 * KaTeX source lines for the steps of one case (or the model), in order. Unlike `stepToKatex`
 * one step at a time, reaction steps that are solved together get the operand decimals their
 * group needs.
 */
export function stepsToKatex(steps: SolverStep[], options: KatexOptions = {}): string[][] {
  const d = options.decimals ?? 3;
  const ops = stepsOperandDecimals(steps, d);
  return steps.map((s) => stepToKatex(s, { decimals: d, operandDecimals: options.operandDecimals ?? ops.get(s.id) }));
}

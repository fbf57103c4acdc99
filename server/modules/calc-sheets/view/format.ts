import katex from 'katex';
import type { JointLoad, TrussModel } from '@shared/model/truss';
import { stepToKatex, type SolverStep } from '@shared/solver';
import { UNIT_DECIMALS, UNIT_SYSTEMS, factorFormat, numberFormat, unitFromBase, type Quantity, type UnitSystemId } from '@shared/units';
import { forceSenseOf, jointFbdSvg } from '@shared/drawing/truss-svg';
import type { StepView } from './types';
import { breakableTex } from '@shared/text/breakable-tex';

export { breakableTex };

/** How the sheet writes numbers, units, member forces and equations. Pure. */

/**
 * KaTeX output by source: a sheet repeats many equations word for word (the same member's
 * substitution in several steps, headings of every case), and the typesetting is the view's
 * largest cost. Output depends on the source and the display flag only. Bounded: emptied when full.
 * Per process and harmless to leave so: a pure function's memo, nobody's state.
 */
const typeset = new Map<string, string>();
const TYPESET_CACHE_MAX = 50_000;
const typesetStats = { hits: 0, misses: 0 };

function cachedRender(source: string, displayMode: boolean): string {
  const key = `${displayMode ? 'd' : 'i'}${source}`;
  const hit = typeset.get(key);
  if (hit !== undefined) {
    typesetStats.hits += 1;
    return hit;
  }
  typesetStats.misses += 1;
  const html = katex.renderToString(source, { displayMode, output: 'html', throwOnError: true, strict: 'ignore' });
  if (typeset.size >= TYPESET_CACHE_MAX) typeset.clear();
  typeset.set(key, html);
  return html;
}

/** Hits and misses of the KaTeX output cache so far (bench:sheet prints them). */
export function katexCacheStats(): { hits: number; misses: number; size: number } {
  return { ...typesetStats, size: typeset.size };
}

/** Typesets KaTeX source to HTML (display mode). Throws on bad source so a sheet never prints raw TeX. */
export function katexHtml(source: string, display = true): string {
  return cachedRender(source, display);
}

/**
 * Typesets one equation of a step in display style but as inline math, so that a long equation
 * (a moment sum over many joints) breaks after a relation or an operator instead of running off
 * the page. KaTeX breaks inline math only there.
 */
export function equationHtml(source: string): string {
  return cachedRender(`\\displaystyle ${breakableTex(source)}`, false);
}

export interface Formatters {
  system: UnitSystemId;
  unit(q: Quantity): string;
  /** Number in display units, fixed decimals, no unit. */
  num(valueInBase: number, q: Quantity, signed?: boolean): string;
  /** Number with its unit. */
  qty(valueInBase: number, q: Quantity): string;
  /** Member force: "+18.75 kN (T)", "−33.75 kN (C)", "0.00 kN". */
  member(kN: number): string;
  /** Member force without unit, for tables with the unit in the heading: "+18.75", "−33.75", "0.00". */
  memberNum(kN: number): string;
  sense(kN: number): string;
  zeroTol: number;
}

export function formatters(system: UnitSystemId, zeroTol: number): Formatters {
  const unit = (q: Quantity) => UNIT_SYSTEMS[system][q];
  const num = (v: number, q: Quantity, signed = false) => {
    const u = unit(q);
    return numberFormat(unitFromBase(v, u), UNIT_DECIMALS[u], { signed });
  };
  const qty = (v: number, q: Quantity) => `${num(v, q)}\u202f${unit(q)}`;
  const sense = (kN: number) => {
    const s = forceSenseOf(kN, zeroTol);
    return s === '0' ? '0' : `(${s})`;
  };
  const memberNum = (kN: number) => (forceSenseOf(kN, zeroTol) === '0' ? num(0, 'force') : num(kN, 'force', true));
  const member = (kN: number) => {
    const s = forceSenseOf(kN, zeroTol);
    return s === '0' ? `${num(0, 'force')}\u202f${unit('force')}` : `${memberNum(kN)}\u202f${unit('force')} (${s})`;
  };
  return { system, unit, num, qty, member, memberNum, sense, zeroTol };
}

export function isoMinute(at: Date | string): string {
  const d = typeof at === 'string' ? new Date(at) : at;
  if (Number.isNaN(d.getTime())) return String(at);
  return `${d.toISOString().slice(0, 16).replace('T', ' ')} UTC`;
}

/**
 * One step typeset. `operandDecimals` comes from `stepsOperandDecimals` when the step is read
 * with others (reaction steps solved together); otherwise the step chooses its own.
 */
export function stepView(step: SolverStep, fmt: Formatters, operandDecimals?: number): StepView {
  const tex = stepToKatex(step, { decimals: 3, operandDecimals });
  const view: StepView = { id: step.id, title: step.title, lines: tex.map((src) => equationHtml(src)), tex };
  if (step.kind === 'joint') {
    view.svg = jointFbdSvg(step, { formatForce: (kN) => fmt.qty(kN, 'force'), zeroTolerance: fmt.zeroTol });
  }
  return view;
}

export function loadsOf(model: TrussModel, caseId: string): JointLoad[] {
  return model.loadCases.find((c) => c.id === caseId)?.loads ?? [];
}

export function tagOf(model: TrussModel) {
  const joints = new Map(model.joints.map((j) => [j.id, j.tag]));
  const members = new Map(model.members.map((m) => [m.id, m.tag]));
  return { joint: (id: string) => joints.get(id) ?? id, member: (id: string) => members.get(id) ?? id };
}

/** "1.1475 G + 1.5 S": each factor with every digit it has (factorFormat), never cut to two decimals. */
export function factorsText(factors: Record<string, number>): string {
  return Object.entries(factors)
    .map(([id, f], i) => `${i === 0 ? '' : ' + '}${factorFormat(f)}\u2009${id}`)
    .join('');
}

import { describe, expect, it } from 'vitest';
import { create, all, type Unit as MathUnit } from 'mathjs';
import type { TrussModel } from '@shared/model/truss';
import type { DesignInput } from '@shared/model/design-input';
import { runDesign } from '@shared/design/basis';
import { trussSolve } from '@shared/solver';
import { modelFromSketch, parallelChordSketch } from '@shared/solver/test-trusses';
import { demoTruss, kTruss, withTakeoff, withWindAndPatterns } from './support/sheet-samples';
import { buildCalcSheetView, equationHtml, type CalcSheetInput, type CalcSheetView, type StepView } from '../server/modules/calc-sheets/calc-sheet-view';

/**
 * A checker redoes every printed equation of a calc sheet by hand, from the printed numbers.
 * This test does the same: it reads the KaTeX source of every typeset line of several sheets
 * (the demo truss with a roof loading by both methods, a K-truss, trusses solved partly by
 * simultaneous equations, two stiffness solutions, a long truss with large forces, US units),
 * recomputes each line from its printed operands and compares with its printed result to the
 * printed precision: within half a unit of the result's last printed place.
 *
 * The recomputation is independent of the code under test: linear systems are solved with
 * mathjs (lusolve), and the roof loading's arithmetic with units is evaluated by mathjs's unit
 * algebra (1 lbf = 4.4482216152605 N, 1 ft = 0.3048 m, exact by definition, NIST SP 811).
 */

const math = create(all);
math.createUnit('psf', '1 lbf/ft^2');
math.createUnit('plf', '1 lbf/ft');
// mathjs's own kip is 4448.2216 N (rounded); the sheet's kip is 1000 lbf exactly.
math.createUnit('kipf', '1000 lbf');

// ---------------------------------------------------------------------------------------------
// Sheets to read

/** The demo truss with snow checked for span patterns and wind normal to both slopes (invented values). */
function input(model: TrussModel, extra: Partial<CalcSheetInput> = {}, unitSystem: 'SI' | 'US' = 'SI'): CalcSheetInput {
  return {
    firm: { name: 'Hollin Bank Structures (test)', address: '4 Quarry Lane', paperSize: 'A4' },
    project: { name: 'Arithmetic check', jobNumber: 'HB-0001', unitSystem },
    trussName: 'T1',
    subject: 'Truss T1',
    revision: 'A',
    model,
    analysis: trussSolve(model),
    generatedAt: '2026-12-03T10:00:00Z',
    ...extra,
  };
}

function sheets(): { name: string; view: CalcSheetView }[] {
  const out: { name: string; view: CalcSheetView }[] = [];
  const demoExact = withTakeoff(demoTruss(), 'exact', 4.5);
  out.push({ name: 'demo truss, takeoff exact (SI)', view: buildCalcSheetView(input(demoExact.model, { takeoffSteps: demoExact.takeoffSteps })) });
  const demoTrib = withTakeoff(demoTruss(), 'tributary', [4.5, 3.7, 4.1, 4.5, 3.9]);
  out.push({ name: 'demo truss, takeoff tributary (US units)', view: buildCalcSheetView(input(demoTrib.model, { takeoffSteps: demoTrib.takeoffSteps }, 'US')) });
  const windSi = withWindAndPatterns(demoTruss(), 'exact', [4.5, 3.7, 4.1, 4.5, 3.9], 2);
  out.push({ name: 'demo truss, wind and snow patterns, exact (SI)', view: buildCalcSheetView(input(windSi.model, { takeoffSteps: windSi.takeoffSteps })) });
  const windUs = withWindAndPatterns(demoTruss(), 'tributary', 4.5, 0);
  out.push({ name: 'demo truss, wind and snow patterns, tributary (US units)', view: buildCalcSheetView(input(windUs.model, { takeoffSteps: windUs.takeoffSteps }, 'US')) });
  out.push({ name: 'K-truss', view: buildCalcSheetView(input(modelFromSketch(kTruss()))) });
  // Two pins and a three-hinged outline: reactions found at the joints, some unknowns together.
  out.push({
    name: 'two-pin frame (simultaneous)',
    view: buildCalcSheetView(
      input(
        modelFromSketch({
          joints: [['A', 0, 0], ['B', 4.3, 0], ['C', 2.1, 3.2], ['E', 6.4, 3.1], ['F', 8.9, 0]],
          members: [['A', 'B'], ['A', 'C'], ['B', 'C'], ['C', 'E'], ['B', 'E'], ['E', 'F']],
          supports: [{ at: 'A', kind: 'pin' }, { at: 'F', kind: 'pin' }],
          cases: [{ id: 'W', loads: [['E', 5.3, -10.7], ['C', 0, -7.9]] }],
        }),
      ),
    ),
  });
  // Stiffness: a Pratt truss pinned at both ends (one degree indeterminate) and a braced square.
  const pinned = parallelChordSketch('pratt', 6, 2.35, 1.85, 23.7);
  out.push({
    name: 'Pratt pinned at both ends (stiffness)',
    view: buildCalcSheetView(input(modelFromSketch({ ...pinned, supports: [{ at: 'L0', kind: 'pin' }, { at: 'L6', kind: 'pin' }], EA: 213_400 }))),
  });
  out.push({
    name: 'braced square (stiffness)',
    view: buildCalcSheetView(
      input(
        modelFromSketch({
          joints: [['A', 0, 0], ['B', 3.7, 0], ['C', 3.7, 2.9], ['D', 0, 2.9]],
          members: [['A', 'B'], ['B', 'C'], ['C', 'D'], ['D', 'A'], ['A', 'C'], ['B', 'D']],
          supports: [{ at: 'A', kind: 'pin' }, { at: 'B', kind: 'roller' }],
          cases: [{ id: 'H', loads: [['D', 11.3, 0], ['C', 0, -4.7]] }],
          EA: 96_500,
        }),
      ),
    ),
  });
  // Long, with forces in the hundreds of kN and cosines that do not terminate.
  out.push({ name: '20-panel Pratt, large forces', view: buildCalcSheetView(input(modelFromSketch(parallelChordSketch('pratt', 20, 1.7, 1.3, 37.3)))) });
  return out;
}

function allSteps(view: CalcSheetView): StepView[] {
  const steps: StepView[] = [view.stability, ...view.takeoff];
  for (const c of view.cases) {
    steps.push(...c.zeroForce.steps, ...c.reactionSteps, ...c.jointSteps, ...c.simultaneousSteps, ...c.stiffnessSteps, c.check);
  }
  return steps;
}

// ---------------------------------------------------------------------------------------------
// Reading KaTeX source back

/** Splits at `sep` where braces and parentheses are balanced. */
function splitTop(s: string, sep: string): string[] {
  const out: string[] = [];
  let depth = 0;
  let start = 0;
  for (let i = 0; i < s.length; i++) {
    const ch = s[i];
    if (ch === '\\' && (s[i + 1] === '{' || s[i + 1] === '}')) {
      i++;
      continue;
    }
    if (ch === '{' || ch === '(') depth++;
    else if (ch === '}' || ch === ')') depth--;
    else if (depth === 0 && s.startsWith(sep, i)) {
      out.push(s.slice(start, i));
      start = i + sep.length;
      i += sep.length - 1;
    }
  }
  out.push(s.slice(start));
  return out;
}

const NUMBER = /^\(?(-?\d+(?:\.\d+)?)\)?$/;

function decimalsOf(text: string): number {
  const m = /\.(\d+)/.exec(text);
  return m ? m[1].length : 0;
}

/** A printed number with the half-unit of its last place. */
interface Printed {
  value: number;
  half: number;
}
function printedNumber(text: string): Printed {
  const m = NUMBER.exec(text.trim());
  if (!m) throw new Error(`not a number: ${text}`);
  return { value: Number(m[1]), half: 0.5 * 10 ** -decimalsOf(m[1]) };
}

interface Term {
  sign: number;
  coefficient: Printed;
  /** Unknown symbol, or null for a known value. */
  symbol: string | null;
  value: Printed | null;
}

/** `\Sigma F_x\big|_{A} = 0:\quad -0.800\,F_{AC} + 0.600 \times (-12.500) + 50.000 = 0` */
function equationRead(line: string): { terms: Term[]; check: boolean } | null {
  const colon = line.indexOf(':\\quad ');
  if (!line.startsWith('\\Sigma') || colon < 0) return null;
  let body = line.slice(colon + ':\\quad '.length);
  const check = body.endsWith('\\quad\\text{(check)}');
  if (check) body = body.slice(0, -'\\quad\\text{(check)}'.length);
  if (!body.endsWith(' = 0')) throw new Error(`equation without "= 0": ${line}`);
  body = body.slice(0, -' = 0'.length);
  const pieces: { sign: number; text: string }[] = [];
  let first = true;
  for (const plus of splitTop(body, ' + ')) {
    splitTop(plus, ' - ').forEach((p, k) => {
      let sign = k === 0 ? 1 : -1;
      let text = p;
      if (first && text.startsWith('-')) {
        sign = -1;
        text = text.slice(1);
      }
      first = false;
      pieces.push({ sign, text });
    });
  }
  const one: Printed = { value: 1, half: 0 };
  const terms = pieces.map(({ sign, text }): Term => {
    const times = splitTop(text, ' \\times ');
    if (times.length === 2) return { sign, coefficient: printedNumber(times[0]), symbol: null, value: printedNumber(times[1]) };
    if (NUMBER.test(text)) return { sign, coefficient: one, symbol: null, value: printedNumber(text) };
    const m = /^(\d+\.\d+)\\,(.+)$/.exec(text);
    if (m) return { sign, coefficient: printedNumber(m[1]), symbol: m[2], value: null };
    return { sign, coefficient: one, symbol: text, value: null };
  });
  return { terms, check };
}

/** `\Rightarrow\ F_{AB} = 62.500\ \mathrm{kN}\ (\mathrm{T})` */
function solutionRead(line: string): { symbol: string; printed: Printed } | null {
  const m = /^\\Rightarrow\\ (.+) = (-?\d+\.\d+)\\ \\mathrm\{kN\}/.exec(line);
  return m ? { symbol: m[1], printed: printedNumber(m[2]) } : null;
}

interface Mismatch {
  sheet: string;
  step: string;
  line: string;
  got: number;
  printed: number;
}

/** Solves the printed equations for the printed unknowns with mathjs and compares. */
function linearCheck(sheet: string, step: string, equations: { terms: Term[] }[], solutions: { symbol: string; printed: Printed }[], bad: Mismatch[]): number {
  const symbols = solutions.map((s) => s.symbol);
  const a = equations.map((eq) => symbols.map((sym) => eq.terms.filter((t) => t.symbol === sym).reduce((s, t) => s + t.sign * t.coefficient.value, 0)));
  const b = equations.map((eq) => -eq.terms.filter((t) => t.symbol === null).reduce((s, t) => s + t.sign * t.coefficient.value * t.value!.value, 0));
  for (const eq of equations) {
    for (const t of eq.terms) if (t.symbol !== null && !symbols.includes(t.symbol)) throw new Error(`${sheet} ${step}: unknown ${t.symbol} has no printed solution`);
  }
  let x: number[];
  if (a.length === symbols.length) {
    x = (math.lusolve(a, b) as number[][]).map((r) => r[0]);
  } else {
    const at = math.transpose(a);
    x = (math.lusolve(math.multiply(at, a) as number[][], math.multiply(at, b) as number[]) as number[][]).map((r) => r[0]);
  }
  solutions.forEach((s, i) => {
    if (!(Math.abs(x[i] - s.printed.value) <= s.printed.half * (1 + 1e-9) + 1e-12)) {
      bad.push({ sheet, step, line: `${s.symbol} from ${equations.length} equation(s)`, got: x[i], printed: s.printed.value });
    }
  });
  return solutions.length;
}

/** A check equation with the printed solutions put in: what is left must be no more than the printed roundings explain. */
function residualCheck(sheet: string, step: string, eq: { terms: Term[] }, known: Map<string, Printed>, bad: Mismatch[]) {
  let sum = 0;
  let bound = 1e-12;
  for (const t of eq.terms) {
    const v = t.symbol === null ? t.value! : known.get(t.symbol);
    if (!v) throw new Error(`${sheet} ${step}: check equation uses ${t.symbol}, not solved`);
    sum += t.sign * t.coefficient.value * v.value;
    bound += Math.abs(t.coefficient.value) * v.half + Math.abs(v.value) * t.coefficient.half + t.coefficient.half * v.half;
  }
  if (Math.abs(sum) > bound * (1 + 1e-9)) bad.push({ sheet, step, line: 'check equation', got: sum, printed: 0 });
}

/** Half-unit tolerance on a printed result. */
function agrees(got: number, printed: Printed): boolean {
  return Math.abs(got - printed.value) <= printed.half * (1 + 1e-9) + 1e-12;
}

// Takeoff lines: `w &= q\,b_{p} = 1.13\,\mathrm{kPa} \times 2.000\,\mathrm{m} = 2.26\,\mathrm{kN/m}`
const UNIT_TEX: Record<string, string> = {
  m: 'm',
  ft: 'ft',
  kPa: 'kPa',
  psf: 'psf',
  'kN/m': 'kN/m',
  plf: 'plf',
  kN: 'kN',
  kip: 'kipf',
  lbf: 'lbf',
};

function texToMath(seg: string): string {
  let s = seg;
  s = s.replace(/\\mathrm\{([^}]*)\}/g, (_, u: string) => {
    const unit = UNIT_TEX[u];
    if (!unit) throw new Error(`unit ${u} not known to the test`);
    return ` ${unit}`;
  });
  s = s.replace(/\\tfrac\{1\}\{2\}/g, '0.5 * ');
  for (let i = 0; i < 3; i++) s = s.replace(/\\frac\{([^{}]*)\}\{([^{}]*)\}/g, '(($1) / ($2))');
  s = s.replace(/\\times 10\^\{(-?\d+)\}/g, ' * 1e$1').replace(/\\times/g, '*').replace(/\\,/g, ' ');
  if (/\\|[a-zA-Z_]{2,}_|\^/.test(s.replace(/\b(kPa|psf|kN\/m|plf|kN|kipf|lbf|ft|m)\b/g, ''))) throw new Error(`not plain arithmetic: ${seg}`);
  return s;
}

function resultRead(seg: string): { printed: Printed; unit: string | null; percent: boolean } | null {
  const m = /^\s*(-?\d+(?:\.\d+)?)(?:\\,(?:\\mathrm\{([^}]*)\}|(\\%)))?\s*$/.exec(seg);
  if (!m) return null;
  return { printed: printedNumber(m[1]), unit: m[2] ? UNIT_TEX[m[2]] ?? null : null, percent: Boolean(m[3]) };
}

function takeoffCheck(sheet: string, step: StepView, bad: Mismatch[]): number {
  let checked = 0;
  // Each row of a takeoff step is one equation of the step (the sheet splits its aligned block).
  const tex = step.tex.join(' \\\\\n');
  const printedR = new Map<string, Printed>();
  for (const raw of tex.split(/\\\\\n?/)) {
    const line = raw.trim().replace(/^&/, '').replace(/\s*\\quad\s*\\text\{[^}]*\}\s*$/, '');
    if (!line) continue;
    const segs = splitTop(line.replace('&=', '='), ' = ').map((s) => s.trim());
    if (segs.length < 2) continue;
    const result = resultRead(segs[segs.length - 1].replace(/\\quad.*$/, ''));
    if (!result) continue;
    const head = segs[0];
    if (/^R_/.test(head)) printedR.set(head, result.printed);
    const expr = segs[segs.length - 2];
    if (/^-R_/.test(expr)) {
      // P = −R: the joint load is the printed reaction with its sign turned.
      const r = printedR.get(expr.slice(1));
      if (!r) throw new Error(`${sheet} ${step.id}: ${expr} not printed before`);
      checked++;
      if (!agrees(-r.value, result.printed)) bad.push({ sheet, step: step.id, line, got: -r.value, printed: result.printed.value });
      continue;
    }
    // Only a segment of printed numbers is arithmetic to redo (digits in subscripts are names).
    if (!/\d/.test(expr.replace(/[_^]\{[^}]*\}|[_^]\d/g, '')) || segs.length < 3) continue;
    let value: number | MathUnit;
    try {
      value = math.evaluate(texToMath(expr)) as number | MathUnit;
    } catch (e) {
      throw new Error(`${sheet} ${step.id}: cannot read "${expr}" (${(e as Error).message})`);
    }
    let got: number;
    if (typeof value === 'number') got = result.percent ? value * 100 : value;
    else got = result.unit ? value.toNumber(result.unit) : NaN;
    checked++;
    if (!agrees(got, result.printed)) bad.push({ sheet, step: step.id, line, got, printed: result.printed.value });
  }
  return checked;
}

/** Reads and redoes every line of a sheet; returns the count of results checked. */
function sheetCheck(sheet: string, view: CalcSheetView, bad: Mismatch[]): number {
  let checked = 0;
  const steps = allSteps(view);
  // The printed source is what was typeset.
  for (const s of steps) {
    expect(s.tex.length).toBe(s.lines.length);
    if (view.takeoff.includes(s)) s.tex.forEach((t, k) => expect(s.lines[k]).toBe(equationHtml(t)));
  }
  for (const s of view.takeoff) checked += takeoffCheck(sheet, s, bad);

  const linear = (groupSteps: StepView[]) => {
    const equations: { terms: Term[] }[] = [];
    const checks: { terms: Term[] }[] = [];
    const solutions: { symbol: string; printed: Printed }[] = [];
    for (const s of groupSteps) {
      for (const line of s.tex) {
        const eq = equationRead(line);
        if (eq) (eq.check ? checks : equations).push(eq);
        const sol = solutionRead(line);
        if (sol) solutions.push(sol);
      }
    }
    const id = groupSteps.map((s) => s.id).join(' + ');
    checked += linearCheck(sheet, id, equations, solutions, bad);
    const known = new Map(solutions.map((s) => [s.symbol, s.printed]));
    for (const c of checks) residualCheck(sheet, id, c, known, bad);
  };

  for (const c of view.cases) {
    // Reactions: the equations since the last reaction found, up to the one that finds the next.
    let group: StepView[] = [];
    for (const s of c.reactionSteps) {
      group.push(s);
      if (s.tex.some((l) => solutionRead(l))) {
        linear(group);
        group = [];
      }
    }
    for (const s of [...c.jointSteps, ...c.simultaneousSteps]) linear([s]);
    for (const s of c.stiffnessSteps) {
      for (const line of s.tex) {
        const k = /^k_\{.*\} = \\frac\{EA\}\{L\} = \\frac\{(\d+(?:\.\d+)?)\}\{(\d+\.\d+)\} = (\d+\.\d+)\\ \\mathrm\{kN\/m\}/.exec(line);
        if (k) {
          checked++;
          const got = Number(k[1]) / Number(k[2]);
          if (!agrees(got, printedNumber(k[3]))) bad.push({ sheet, step: s.id, line, got, printed: Number(k[3]) });
        }
        const f = /= k\\,\\delta = (\d+\.\d+) \\times (-?\d+\.\d+)\\times 10\^\{-3\} = (-?\d+\.\d+)\\ \\mathrm\{kN\}/.exec(line);
        if (f) {
          checked++;
          const got = Number(f[1]) * Number(f[2]) * 1e-3;
          if (!agrees(got, printedNumber(f[3]))) bad.push({ sheet, step: s.id, line, got, printed: Number(f[3]) });
        }
      }
    }
    // Residual relative to the largest load, each as printed (3 significant figures).
    const [abs, rel] = c.check.tex;
    // Written m \times 10^{n} (texScientific), never 2.01e-14.
    const sci = (m: string, e: string) => Number(m) * 10 ** Number(e);
    const r = /= (\d\.\d\d) \\times 10\^\{(-?\d+)\}\\ \\mathrm\{kN\}/.exec(abs);
    const q = /load } (\d+\.\d+)\\ \\mathrm\{kN\}:\\ (\d\.\d\d) \\times 10\^\{(-?\d+)\}/.exec(rel);
    if (r && q && Number(q[1]) > 0) {
      checked++;
      const got = sci(r[1], r[2]) / Number(q[1]);
      const printed = sci(q[2], q[3]);
      if (!(Math.abs(got - printed) <= 0.5 * 10 ** (Math.floor(Math.log10(printed)) - 2) * (1 + 1e-9))) {
        bad.push({ sheet, step: c.check.id, line: rel, got, printed });
      }
    }
  }
  // m + r = a + b = c and 2j = 2 × j = n.
  for (const line of view.stability.tex) {
    const m = /^m \+ r = (\d+) \+ (\d+) = (\d+) .* 2j = 2 \\times (\d+) = (\d+)$/.exec(line);
    if (m) {
      checked += 2;
      if (Number(m[1]) + Number(m[2]) !== Number(m[3])) bad.push({ sheet, step: 'stability', line, got: Number(m[1]) + Number(m[2]), printed: Number(m[3]) });
      if (2 * Number(m[4]) !== Number(m[5])) bad.push({ sheet, step: 'stability', line, got: 2 * Number(m[4]), printed: Number(m[5]) });
    }
  }
  return checked;
}

describe('calc sheet arithmetic redone by hand from the printed numbers', () => {
  const built = sheets();

  it('when every equation of nine sheets is redone from its printed operands, then every printed result comes back to its printed precision: 0 mismatches', () => {
    const bad: Mismatch[] = [];
    const counts: Record<string, number> = {};
    for (const { name, view } of built) counts[name] = sheetCheck(name, view, bad);
    // Each sheet had arithmetic to redo, and the readers found it (a reader that matched nothing would pass silently).
    for (const [name, n] of Object.entries(counts)) expect(n, name).toBeGreaterThan(10);
    // The wind and span-pattern steps were among those redone.
    const newSteps = built.flatMap((b) => b.view.takeoff.filter((s) => /\/(wind|span-pattern)$/.test(s.id)));
    expect(newSteps.length).toBeGreaterThan(10);
    // …and each had lines the reader redid: a wind step its sines, cosines, pressures, components
    // and joint loads; a pattern step its sums and statics.
    for (const s of newSteps) expect(takeoffCheck('new steps', s, bad), s.id).toBeGreaterThanOrEqual(s.id.endsWith('/wind') ? 8 : 2);
    expect(bad).toEqual([]);
    const methods = built.flatMap((b) => b.view.cases.map((c) => c.method));
    expect(methods.some((m) => /simultaneous/i.test(m))).toBe(true);
    expect(methods.some((m) => /stiffness/i.test(m))).toBe(true);
  });

  it('when operands were printed at the default decimals only, then the readers find the mismatches a checker would flag (the test can fail)', () => {
    // The same demo takeoff in US units and the long Pratt, with every operand at the result's
    // decimals (the sheet before operands carried digits): some lines no longer multiply out.
    const bad: Mismatch[] = [];
    const long = built.find((b) => b.name.startsWith('20-panel'))!;
    const squeezed = structuredClone(long.view);
    for (const c of squeezed.cases) {
      for (const s of c.jointSteps) s.tex = s.tex.map((l) => l.replace(/(\d+\.\d{3})\d+/g, '$1'));
    }
    sheetCheck('20-panel with operands cut to 3 decimals', squeezed, bad);
    // Cutting digits that were there changes nothing when none were added; so some must have been.
    const added = long.view.cases.flatMap((c) => c.jointSteps).some((s) => s.tex.some((l) => /\d+\.\d{4,}/.test(l)));
    expect(added).toBe(true);
    expect(bad.length).toBeGreaterThan(0);
  });
});

// ---------------------------------------------------------------------------------------------
// Member design and deflection pages: each step redone from its printed operands with mathjs's
// unit algebra (ksi = 1000 lbf/in², kip = 1000 lbf, exact by definition, NIST SP 811).

math.createUnit('ksi', '1000 lbf/in^2');

const DESIGN_UNIT_TEXT: [RegExp, string][] = [
  [/in²/g, 'in^2'],
  [/mm²/g, 'mm^2'],
  [/\bkip\b/g, 'kipf'],
];

/** A printed design expression as mathjs text: numbers with their units in brackets. */
function designToMath(text: string): string {
  let s = text;
  for (const [re, to] of DESIGN_UNIT_TEXT) s = s.replace(re, to);
  s = s.replace(/(\d+(?:\.\d+)?) (ksi|MPa|kipf|kN|in\^2|mm\^2|in|mm)\b/g, '($1 $2)');
  return s.replace(/×/g, '*').replace(/π/g, 'pi').replace(/√\(/g, 'sqrt(').replace(/²/g, '^2').replace(/−/g, '-').replace(/\[/g, '(').replace(/\]/g, ')');
}

/** "77.5 kip" → the number and its mathjs unit; null for words. */
function designPrinted(text: string): { printed: Printed; unit: string | null } | null {
  const m = /^(-?\d+(?:\.\d+)?)(?: (ksi|MPa|kip|kN|in²|mm²|in|mm))?$/.exec(text.trim());
  if (!m) return null;
  const unit = m[2] ? designToMath(`1 ${m[2]}`).replace(/^\(1 (.+)\)$/, '$1') : null;
  return { printed: printedNumber(m[1]), unit };
}

function designEvaluate(expr: string, unit: string | null): number {
  const v = math.evaluate(designToMath(expr)) as number | MathUnit;
  if (typeof v === 'number') return v;
  return unit ? v.toNumber(unit) : NaN;
}

/** Redoes one design step: every "a = b" link of its numbers and its result. Returns results checked. */
function designStepCheck(sheet: string, cells: string[], bad: Mismatch[]): number {
  const [clause, , , substituted, resultCell] = cells;
  if (!/\d/.test(substituted) || /^Table|confirmed/.test(substituted)) return 0;
  const result = resultCell.replace(/ (≤|>) [\d.]+(: fails)?$/, '');
  const segs = [...substituted.split(' = '), result];
  let checked = 0;
  for (let i = 0; i + 1 < segs.length; i++) {
    let left = segs[i];
    const right = segs[i + 1];
    const cmp = /^(.+) (≤|>) (.+)$/.exec(left);
    if (cmp) {
      // "125 > 4.71 × √(E/Fy)": the comparison holds as printed, and its right side is redone.
      const a = designEvaluate(cmp[1], null);
      const b = designEvaluate(cmp[3], null);
      if (cmp[2] === '≤' ? !(a <= b) : !(a > b)) bad.push({ sheet, step: clause, line: left, got: a, printed: b });
      left = cmp[3];
    }
    const maxL = /^max\((.+)\)$/.exec(left);
    const maxR = /^max\((.+)\)$/.exec(right);
    if (maxL && maxR) {
      const ls = splitTop(maxL[1], ', ');
      const rs = splitTop(maxR[1], ', ');
      ls.forEach((l, k) => {
        const p = designPrinted(rs[k])!;
        const got = designEvaluate(l, p.unit);
        checked++;
        if (!agrees(got, p.printed)) bad.push({ sheet, step: clause, line: `${l} = ${rs[k]}`, got, printed: p.printed.value });
      });
      continue;
    }
    const p = designPrinted(right);
    if (!p || !/\d/.test(left)) continue;
    const got = designEvaluate(left, p.unit);
    checked++;
    if (!agrees(got, p.printed)) bad.push({ sheet, step: clause, line: `${left} = ${right}`, got, printed: p.printed.value });
  }
  return checked;
}

/** Every design step and every deflection row of a sheet, redone. */
function designSheetCheck(sheet: string, view: CalcSheetView, bad: Mismatch[]): number {
  let checked = 0;
  for (const g of view.designChecks.groups) {
    for (const row of g.governing?.steps ?? []) if (row.cls !== 'step-head') checked += designStepCheck(sheet, row.cells, bad);
  }
  const us = view.deflection.units.length === 'in';
  for (const t of view.deflection.tables) {
    let sum = 0;
    let bound = 1e-12;
    for (const row of t.rows) {
      const [, n, N, L, A, E, term] = row.cells.map((c) => c.replace('\u2212', '-'));
      // n·N·L/(A·E): kip·in/(in²·ksi) = in; kN·mm/(mm²·MPa) = 1/1000 mm, so × 1000 (kN to N).
      const got = (Number(n) * Number(N) * Number(L) * (us ? 1 : 1000)) / (Number(A) * Number(E));
      const printed = printedNumber(term);
      checked++;
      if (!agrees(got, printed)) bad.push({ sheet, step: t.title, line: row.cells.join(' | '), got, printed: printed.value });
      sum += printed.value;
      bound += printed.half;
    }
    const m = /^Σ = δy = (−?\d+\.\d+) (in|mm)$/.exec(t.sum)!;
    const shown = printedNumber(m[1].replace('\u2212', '-'));
    checked++;
    if (Math.abs(sum - shown.value) > shown.half + bound) bad.push({ sheet, step: t.title, line: t.sum, got: sum, printed: shown.value });
  }
  for (const row of view.deflection.rows) {
    const m = /^(\d+(?:\.\d+)?)\/(\d+) = (\d+\.\d+)$/.exec(row.cells[4]);
    if (!m) continue;
    checked++;
    if (!agrees(Number(m[1]) / Number(m[2]), printedNumber(m[3]))) bad.push({ sheet, step: 'deflection', line: row.cells[4], got: Number(m[1]) / Number(m[2]), printed: Number(m[3]) });
  }
  return checked;
}

function designSheets(): { name: string; view: CalcSheetView }[] {
  const base = withTakeoff(demoTruss(), 'exact', 4.5).model;
  const webs = base.members.filter((m) => !(m.from.startsWith('L') && m.to.startsWith('L')) && !/^(L0|L6|U\d)(L0|L6|U\d)$/.test(m.id)).map((m) => m.id);
  const bottom = base.members.filter((m) => m.from.startsWith('L') && m.to.startsWith('L')).map((m) => m.id);
  const deflection = { joints: ['L3'], combinations: ['S'], limit: 240 };
  const designed = (design: DesignInput, system: 'SI' | 'US') => {
    const model = { ...base, design };
    const analysis = trussSolve(model);
    return buildCalcSheetView(input(model, { analysis, design: runDesign(model, analysis) }, system));
  };
  const steel = (standard: DesignInput['standard'], grade: string): DesignInput => ({
    standard,
    groups: [
      { name: 'Chords', members: 'all', material: { kind: 'grade', grade }, section: { shape: 'rect-hollow', B: 80, H: 80, t: 4, An: 1000, U: 0.87 } },
      { name: 'Webs', members: webs, material: { kind: 'grade', grade }, section: { shape: 'angle', b: 50, d: 50, t: 5 }, Ly: 1.1 },
      // The bottom chord is in tension: its page carries the D2/D3 (6.2.3) steps.
      { name: 'Bottom chord', members: bottom, material: { kind: 'grade', grade }, section: { shape: 'round-hollow', D: 60.3, t: 3.2, An: 480, U: 0.9 } },
    ],
    deflection,
  });
  const timber: DesignInput = {
    standard: 'nds-2018-asd',
    groups: [
      { name: 'All', members: 'all', material: { kind: 'timber', Ft: 4.1, Fc: 7.3, Emin: 3700, E: 9650, c: 0.8 }, section: { shape: 'rectangle', b: 63, d: 184 } },
      { name: 'Bottom chord', members: bottom, material: { kind: 'timber', Ft: 4.1, Fc: 7.3, Emin: 3700, E: 9650, c: 0.8 }, section: { shape: 'rectangle', b: 63, d: 235, An: 12_000 } },
    ],
    deflection,
  };
  return [
    { name: 'design AISC LRFD (US units)', view: designed(steel('aisc360-16-lrfd', 'A992'), 'US') },
    { name: 'design AISC ASD (US units)', view: designed(steel('aisc360-16-asd', 'A36'), 'US') },
    { name: 'design NDS timber (US units)', view: designed(timber, 'US') },
    { name: 'design EN 1993-1-1 (SI)', view: designed({ ...steel('en1993-1-1', 'S355'), groups: steel('en1993-1-1', 'S355').groups.map((g) => ({ ...g, curve: 'c' as const })) }, 'SI') },
    { name: 'design AISC LRFD (SI)', view: designed(steel('aisc360-16-lrfd', 'A992'), 'SI') },
  ];
}

describe('member design and deflection pages redone by hand from the printed numbers', () => {
  it('when every design step, ratio and unit-load row of five sheets (three in US units) is redone, then each printed result comes back: 0 mismatches', () => {
    const bad: Mismatch[] = [];
    for (const { name, view } of designSheets()) {
      expect(view.designChecks.present, name).toBe(true);
      expect(view.designChecks.error, name).toBeNull();
      const n = designSheetCheck(name, view, bad);
      // Governing steps of every group, both deflection tables' rows and the allowed span.
      expect(view.designChecks.groups.some((g) => g.governing?.steps.some((r) => /^Tension/.test(r.cells[0]))), name).toBe(true);
      expect(n, name).toBeGreaterThan(15);
    }
    expect(bad).toEqual([]);
  });

  it('when an operand is cut to three figures, then the reader finds the mismatch (the test can fail)', () => {
    const [us] = designSheets();
    const bad: Mismatch[] = [];
    const cut = structuredClone(us.view);
    for (const g of cut.designChecks.groups) for (const s of g.governing?.steps ?? []) s.cells[3] = s.cells[3].replace(/(\d+\.\d)\d+/g, '$1');
    designSheetCheck('cut', cut, bad);
    expect(bad.length).toBeGreaterThan(0);
  });
});

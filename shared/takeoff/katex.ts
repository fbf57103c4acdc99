import { UNIT_DECIMALS, UNIT_SYSTEMS, numberFormat, unitFromBase, unitToBase, type Unit, type UnitSystemId } from '@shared/units';
import { MAX_EXTRA_DECIMALS, carries, carryDecimals, printedValue } from '../solver/printed-digits';
import type { TakeoffStep, TakeoffUnit, TakeoffValue } from './steps';
import { texText } from '../text/safe-text';

/** How a step is written: which unit system the numbers are shown in. */
export interface TakeoffKatexOptions {
  /** 'si' (default): m, kPa, kN/m, kN. 'us': ft, psf, plf, kip. */
  system?: UnitSystemId;
  /** The letter of the truss's joint loads (loadLetterOf in shared/solver); default P. */
  loadLetter?: string;
}

const QUANTITY_OF: Partial<Record<TakeoffUnit, keyof (typeof UNIT_SYSTEMS)['si']>> = {
  m: 'length',
  kPa: 'pressure',
  'kN/m': 'line-load',
  kN: 'force',
  'kN·m': 'moment',
};

const KATEX_UNIT: Partial<Record<Unit | '%', string>> = {
  'kN·m': '\\mathrm{kN\\,m}',
  'kip·ft': '\\mathrm{kip\\,ft}',
  'lbf·ft': '\\mathrm{lbf\\,ft}',
  'kip·in': '\\mathrm{kip\\,in}',
  'kN/m²': '\\mathrm{kN/m^2}',
  '%': '\\%',
};

/** The display unit of a takeoff value in a unit system ('%' and '1' stay as they are). */
function displayUnit(v: Pick<TakeoffValue, 'unit'>, system: UnitSystemId): Unit | '%' | '1' {
  if (v.unit === '%' || v.unit === '1') return v.unit;
  const q = QUANTITY_OF[v.unit];
  return q ? UNIT_SYSTEMS[system][q] : (v.unit as Unit);
}

/** Decimals a value is printed with by default: the display unit's fixed decimals. */
function baseDecimals(v: Pick<TakeoffValue, 'unit'>, system: UnitSystemId): number {
  const u = displayUnit(v, system);
  return u === '%' ? 1 : u === '1' ? 4 : UNIT_DECIMALS[u];
}

/** The value as shown (display unit, `extra` more decimals than the default). */
function shownNumber(v: Pick<TakeoffValue, 'unit' | 'value'>, system: UnitSystemId, extra = 0): number {
  const u = displayUnit(v, system);
  const shown = u === '%' || u === '1' ? v.value : unitFromBase(v.value, u);
  return printedValue(shown, baseDecimals(v, system) + extra);
}

/** The value as shown, taken back to its computing unit — what a checker multiplies with. */
function shownInBase(v: Pick<TakeoffValue, 'unit' | 'value'>, system: UnitSystemId, extra = 0): number {
  const u = displayUnit(v, system);
  const shown = shownNumber(v, system, extra);
  return u === '%' || u === '1' ? shown : unitToBase(shown, u);
}

/** A number with its unit as KaTeX source, in the chosen unit system, `extra` more decimals. */
function quantity(v: Pick<TakeoffValue, 'unit' | 'value'>, system: UnitSystemId, withUnit = true, extra = 0): string {
  const u = displayUnit(v, system);
  const digits = numberFormat(u === '%' || u === '1' ? v.value : unitFromBase(v.value, u), baseDecimals(v, system) + extra, { asciiMinus: true });
  if (!withUnit || u === '1') return digits;
  if (u === '%') return `${digits}\\,\\%`;
  return `${digits}\\,${KATEX_UNIT[u] ?? `\\mathrm{${u}}`}`;
}

/**
 * Extra decimals for the operands of one printed line so that the line, redone from its printed
 * operands (converted back to computing units), gives its printed result to the result's printed
 * precision (shared/solver/printed-digits.ts says why).
 */
function operandExtra(
  operands: Pick<TakeoffValue, 'unit' | 'value'>[],
  compute: (operandsInBase: number[]) => number,
  result: Pick<TakeoffValue, 'unit' | 'value'>,
  system: UnitSystemId,
): number {
  const d = baseDecimals(result, system);
  const u = displayUnit(result, system);
  const toShown = (base: number) => (u === '%' || u === '1' ? base : unitFromBase(base, u));
  const want = toShown(result.value);
  const extra = carryDecimals(0, (e) => carries(toShown(compute(operands.map((o) => shownInBase(o, system, e)))), want, d));
  return Math.min(extra, MAX_EXTRA_DECIMALS);
}

function find(step: TakeoffStep, key: string): TakeoffValue {
  const v = step.values.find((x) => x.key === key);
  if (!v) throw new Error(`Takeoff step ${step.id} has no value "${key}".`);
  return v;
}

/**
 * The reaction on truss k per 1 unit of w from the support moments, by statics of the spans
 * next to it (moments sagging positive): c = Σ (δ·½L + (M_far − M_k)/L) over those spans, δ = 1
 * for a loaded span (all spans when `loaded` is null), 0 for an unloaded one. Moments and lengths
 * are printed with the decimals that make the line multiply out to the printed c.
 */
function reactionFromMoments(
  spans: readonly number[],
  momentsPerUnit: readonly number[],
  k: number,
  loaded: readonly boolean[] | null,
  want: TakeoffValue,
  system: UnitSystemId,
): { moments: string; symbolic: string; numeric: string } {
  const n = spans.length;
  const spansHere = [k > 0 ? k - 1 : -1, k < n ? k : -1].filter((i) => i >= 0);
  const isLoaded = (i: number) => loaded === null || loaded[i];
  // Support moments per 1 kN/m are m² (kN·m per kN/m): shown in the length unit squared.
  const lengthUnit = UNIT_SYSTEMS[system].length;
  const areaFactor = unitFromBase(1, lengthUnit) ** 2;
  const mShown = (i: number, d: number) => printedValue(momentsPerUnit[i] * areaFactor, d);
  const mBase = UNIT_DECIMALS[lengthUnit];
  const far = (i: number) => (i === k - 1 ? i : i + 1); // the span's other support
  const exactFrom = (d: number) => {
    let c = 0;
    for (const i of spansHere) {
      const L = unitToBase(printedValue(unitFromBase(spans[i], lengthUnit), d), lengthUnit);
      c += (isLoaded(i) ? L / 2 : 0) + (mShown(far(i), d) / areaFactor - mShown(k, d) / areaFactor) / L;
    }
    return c;
  };
  const d = carryDecimals(mBase, (dd) => carries(unitFromBase(exactFrom(dd), lengthUnit), unitFromBase(want.value, lengthUnit), baseDecimals(want, system)));
  const mTex = (i: number) => numberFormat(mShown(i, d), d, { asciiMinus: true });
  const lTex = (i: number) => numberFormat(unitFromBase(spans[i], lengthUnit), d, { asciiMinus: true });
  const numeric = spansHere
    .map((i) => `${isLoaded(i) ? `\\tfrac{1}{2}(${lTex(i)}) + ` : ''}\\frac{(${mTex(far(i))}) - (${mTex(k)})}{${lTex(i)}}`)
    .join(' + ');
  const symbolic = spansHere
    .map((i) => `${isLoaded(i) ? `\\tfrac{1}{2}L_{${i + 1}} + ` : ''}\\frac{M_{${far(i)}} - M_{${k}}}{L_{${i + 1}}}`)
    .join(' + ');
  const moments = `${Array.from({ length: n + 1 }, (_, i) => `M_{${i}} = ${mTex(i)}`).join(',\\ ')}\\ \\mathrm{${lengthUnit}^2}`;
  return { moments, symbolic, numeric };
}

/** Plain text (a joint tag, a remark) inside KaTeX: the one shared escaping function. */
const text = texText;

/**
 * KaTeX source for one takeoff step, with every number substituted and its unit written
 * (display mode; lines separated inside an `aligned` environment).
 */
export function takeoffStepKatex(step: TakeoffStep, options: TakeoffKatexOptions = {}): string {
  const system = options.system ?? 'si';
  const L = options.loadLetter ?? 'P';
  const q = (key: string, withUnit = true, extra = 0) => quantity(find(step, key), system, withUnit, extra);
  const len = (metres: number, extra = 0) => quantity({ value: metres, unit: 'm' }, system, true, extra);
  const sum = (xs: number[]) => xs.reduce((a, b) => a + b, 0);
  switch (step.kind) {
    case 'purlin-width': {
      const tag = text(step.jointTag);
      const line = (symbol: string, halves: number[], key: string) => {
        const e = operandExtra(halves.map((h) => ({ value: 2 * h, unit: 'm' as const })), (xs) => sum(xs) / 2, find(step, key), system);
        return `${symbol} &= ${halves.map((h) => `\\tfrac{1}{2}(${len(2 * h, e)})`).join(' + ')} = ${q(key)}`;
      };
      return [
        '\\begin{aligned}',
        `${line(`b_{s,${tag}}`, step.halves.map((h) => h.sloped), 'widthSlope')} \\\\`,
        line(`b_{p,${tag}}`, step.halves.map((h) => h.plan), 'widthPlan'),
        '\\end{aligned}',
      ].join('\n');
    }
    case 'purlin-beam': {
      const k = step.trussIndex;
      const n = step.spans.length;
      const spansHere = [k > 0 ? k - 1 : -1, k < n ? k : -1].filter((i) => i >= 0);
      const symbols = spansHere.map((i) => `L_{${i + 1}}`);
      const tributary = symbols.map((s) => `\\tfrac{1}{2}${s}`).join(' + ');
      const spanValues = spansHere.map((i) => ({ value: step.spans[i], unit: 'm' as const }));
      const eTrib = operandExtra(spanValues, (xs) => sum(xs) / 2, find(step, 'tributaryPerUnit'), system);
      const statics = reactionFromMoments(step.spans, step.momentsPerUnit, k, null, find(step, 'exactPerUnit'), system);
      return [
        '\\begin{aligned}',
        `&L_i M_{i-1} + 2(L_i + L_{i+1}) M_i + L_{i+1} M_{i+1} = -\\tfrac{1}{4}\\left(w L_i^3 + w L_{i+1}^3\\right), \\quad M_0 = M_{${n}} = 0 \\quad ${text('(three-moment equation)')} \\\\`,
        `&${text('per 1 unit of w:')}\\ ${statics.moments} \\\\`,
        `&R = c\\,w, \\quad c_{\\mathrm{cont}} = ${statics.symbolic} = ${statics.numeric} = ${q('exactPerUnit')} \\\\`,
        `&c_{\\mathrm{trib}} = ${tributary} = ${spansHere.map((i) => `\\tfrac{1}{2}(${len(step.spans[i], eTrib)})`).join(' + ')} = ${q('tributaryPerUnit')} \\quad ${text('(tributary length)')}`,
        '\\end{aligned}',
      ].join('\n');
    }
    case 'span-pattern': {
      const k = step.trussIndex;
      const n = step.spans.length;
      const loadedIdx = step.loaded.flatMap((l, j) => (l ? [j] : []));
      const rValues = step.contributions.map((r) => ({ value: r, unit: 'm' as const }));
      const eSum = operandExtra(loadedIdx.map((j) => rValues[j]), sum, find(step, 'exactPerUnit'), system);
      const lengthUnit = UNIT_SYSTEMS[system].length;
      const rList = step.contributions.map((_, j) => `r_{${j + 1}} = ${len(step.contributions[j], 1)}`).join(',\\ ');
      const statics = reactionFromMoments(step.spans, step.momentsPerUnit, k, step.loaded, find(step, 'exactPerUnit'), system);
      const spansHere = [k > 0 ? k - 1 : -1, k < n ? k : -1].filter((i) => i >= 0 && step.loaded[i]);
      const eTrib = operandExtra(spansHere.map((i) => ({ value: step.spans[i], unit: 'm' as const })), (xs) => sum(xs) / 2, find(step, 'tributaryPerUnit'), system);
      const lines = [
        `&${text(`reaction on truss ${k + 1} per 1 unit of w on span j alone (three-moment equation):`)}\\ ${rList.replace(/\\,\\mathrm\{[^}]*\}/g, '')}\\ \\mathrm{${lengthUnit}} \\\\`,
        `&c_{\\mathrm{cont}} = ${loadedIdx.map((j) => `r_{${j + 1}}`).join(' + ')}${
          loadedIdx.length > 1 ? ` = ${loadedIdx.map((j) => `(${quantity(rValues[j], system, false, eSum)})`).join(' + ')}` : ''
        } = ${q('exactPerUnit')} \\quad ${text(`(${step.label}: the spans with `)}r_{j} > 0${text(')')} \\\\`,
        `&${text(`${step.label}, per 1 unit of w:`)}\\ ${statics.moments} \\\\`,
        `&c_{\\mathrm{cont}} = ${statics.symbolic} = ${statics.numeric} = ${q('exactPerUnit')} \\quad ${text('(statics of the spans next to the truss)')} \\\\`,
        `&c_{\\mathrm{trib}} = ${spansHere.map((i) => `\\tfrac{1}{2}L_{${i + 1}}`).join(' + ')} = ${spansHere
          .map((i) => `\\tfrac{1}{2}(${len(step.spans[i], eTrib)})`)
          .join(' + ')} = ${q('tributaryPerUnit')} \\quad ${text('(tributary length, loaded spans)')}`,
      ];
      if (step.values.some((v) => v.key === 'differencePct')) {
        const eD = operandExtra([find(step, 'exactPerUnit'), find(step, 'allPerUnit')], ([a, b]) => ((a - b) / b) * 100, find(step, 'differencePct'), system);
        lines[lines.length - 1] += ' \\\\';
        lines.push(
          `&\\Delta_{\\mathrm{all}} = \\frac{c_{\\mathrm{cont}} - c_{\\mathrm{all}}}{c_{\\mathrm{all}}} = \\frac{${q('exactPerUnit', false, eD)} - ${q('allPerUnit', false, eD)}}{${q('allPerUnit', false, eD)}} = ${q('differencePct')} \\quad ${text('(against all spans loaded)')}`,
        );
      }
      return ['\\begin{aligned}', ...lines, '\\end{aligned}'].join('\n');
    }
    case 'wind-purlin': {
      const tag = text(step.jointTag);
      const lines: string[] = [];
      const ks = step.halves.map((_, k) => k);
      for (const k of ks) {
        const h = step.halves[k];
        const i = k + 1;
        const v = (key: string) => find(step, `${key}${k}`);
        lines.push(`&${text(`panel ${step.jointTag}–${h.neighbourTag}, ${h.side} slope`)}`);
        const eSin = operandExtra([v('dy'), v('s')], ([a, b]) => a / b, v('sin'), system);
        const eCos = operandExtra([v('dx'), v('s')], ([a, b]) => a / b, v('cos'), system);
        const deg = (Math.atan2(h.dy, h.dx) * 180) / Math.PI;
        lines.push(`&\\theta_{${i}} = \\arctan(\\Delta y_{${i}} / \\Delta x_{${i}}) = ${numberFormat(deg, 2, { asciiMinus: true })}^{\\circ}`);
        lines.push(`&\\sin\\theta_{${i}} = \\Delta y_{${i}} / s_{${i}} = (${q(`dy${k}`, true, eSin)}) / (${q(`s${k}`, true, eSin)}) = ${q(`sin${k}`)}`);
        lines.push(`&\\cos\\theta_{${i}} = \\Delta x_{${i}} / s_{${i}} = (${q(`dx${k}`, true, eCos)}) / (${q(`s${k}`, true, eCos)}) = ${q(`cos${k}`)}`);
        const eP = operandExtra([find(step, 'q'), v('c')], ([a, b]) => a * b, v('p'), system);
        lines.push(`&p_{${i}} = q\\,c_{${i}} = ${q('q', true, eP)} \\times (${q(`c${k}`, true, eP)}) = ${q(`p${k}`)}`);
        const eN = operandExtra([v('p'), v('half')], ([a, b]) => a * b, v('wn'), system);
        lines.push(`&w_{n,${i}} = p_{${i}}\\,\\tfrac{1}{2}s_{${i}} = (${q(`p${k}`, true, eN)}) \\times ${q(`half${k}`, true, eN)} = ${q(`wn${k}`)}`);
        const eX = operandExtra([v('wn'), v('sin')], ([a, b]) => a * b, v('wx'), system);
        lines.push(`&w_{x,${i}} = w_{n,${i}}\\sin\\theta_{${i}} = (${q(`wn${k}`, true, eX)}) \\times (${q(`sin${k}`, true, eX)}) = ${q(`wx${k}`)}`);
        const eY = operandExtra([v('wn'), v('cos')], ([a, b]) => -a * b, v('wy'), system);
        lines.push(`&w_{y,${i}} = -w_{n,${i}}\\cos\\theta_{${i}} = -(${q(`wn${k}`, true, eY)}) \\times (${q(`cos${k}`, true, eY)}) = ${q(`wy${k}`)}`);
      }
      for (const axis of ['x', 'y'] as const) {
        const parts = ks.map((k) => find(step, `w${axis}${k}`));
        const e = operandExtra(parts, sum, find(step, `w${axis}`), system);
        const symbolic = ks.map((k) => `w_{${axis},${k + 1}}`).join(' + ');
        const numeric = parts.length > 1 ? ` = ${ks.map((k) => `(${q(`w${axis}${k}`, true, e)})`).join(' + ')}` : '';
        lines.push(`&w_{${axis}} = ${symbolic}${numeric} = ${q(`w${axis}`)}`);
      }
      const c = step.chosen === 'exact' ? 'c_{\\mathrm{cont}}' : 'c_{\\mathrm{trib}}';
      for (const axis of ['x', 'y'] as const) {
        const e = operandExtra([find(step, 'perUnit'), find(step, `w${axis}`)], ([a, b]) => a * b, find(step, `f${axis}`), system);
        lines.push(`&${L}_{${tag},${axis}} = ${c}\\,w_{${axis}} = ${q('perUnit', true, e)} \\times (${q(`w${axis}`, true, e)}) = ${q(`f${axis}`)}`);
      }
      return ['\\begin{aligned}', lines.join(' \\\\\n'), '\\end{aligned}'].join('\n');
    }
    case 'line-load': {
      const b = step.basis === 'slope' ? 'b_{s}' : 'b_{p}';
      const e = operandExtra([find(step, 'q'), find(step, 'width')], ([qq, bb]) => qq * bb, find(step, 'w'), system);
      const lines = [`w &= q\\,${b} = ${q('q', true, e)} \\times ${q('width', true, e)} = ${q('w')}`];
      if (step.values.some((v) => v.key === 'qPlan') && step.values.some((v) => v.key === 'widthPlan')) {
        const ep = operandExtra([find(step, 'w'), find(step, 'widthPlan')], ([ww, bp]) => ww / bp, find(step, 'qPlan'), system);
        lines.push(
          `q_{p} &= w / b_{p} = ${q('w', true, ep)} / ${q('widthPlan', true, ep)} = ${q('qPlan')} \\quad ${text('(the same load per unit area of plan, ')}q/\\cos\\theta${text(')')}`,
        );
      }
      return ['\\begin{aligned}', lines.join(' \\\\\n'), '\\end{aligned}'].join('\n');
    }
    case 'purlin-reaction': {
      const tag = text(step.jointTag);
      const product = ([c, w]: number[]) => c * w;
      const eE = operandExtra([find(step, 'exactPerUnit'), find(step, 'w')], product, find(step, 'exact'), system);
      const eT = operandExtra([find(step, 'tributaryPerUnit'), find(step, 'w')], product, find(step, 'tributary'), system);
      const lines = [
        `R_{\\mathrm{cont}} &= c_{\\mathrm{cont}}\\,w = ${q('exactPerUnit', true, eE)} \\times ${q('w', true, eE)} = ${q('exact')}`,
        `R_{\\mathrm{trib}} &= c_{\\mathrm{trib}}\\,w = ${q('tributaryPerUnit', true, eT)} \\times ${q('w', true, eT)} = ${q('tributary')}`,
      ];
      if (step.differencePct !== null) {
        const eD = operandExtra([find(step, 'tributary'), find(step, 'exact')], ([t, x]) => ((t - x) / x) * 100, find(step, 'differencePct'), system);
        lines.push(
          `\\Delta &= \\frac{R_{\\mathrm{trib}} - R_{\\mathrm{cont}}}{R_{\\mathrm{cont}}} = \\frac{${q('tributary', false, eD)} - ${q('exact', false, eD)}}{${q('exact', false, eD)}} = ${q('differencePct')}`,
        );
      }
      const chosen = step.chosen === 'exact' ? 'R_{\\mathrm{cont}}' : 'R_{\\mathrm{trib}}';
      lines.push(`${L}_{${tag},y} &= -${chosen} = ${q('fy')}${step.pattern ? ` \\quad ${text(`(${step.pattern})`)}` : ''}`);
      return ['\\begin{aligned}', lines.join(' \\\\\n'), '\\end{aligned}'].join('\n');
    }
  }
}

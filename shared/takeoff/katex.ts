import { UNIT_DECIMALS, UNIT_SYSTEMS, numberFormat, unitFromBase, type Unit, type UnitSystemId } from '@shared/units';
import type { TakeoffStep, TakeoffUnit, TakeoffValue } from './steps';
import { texText } from '../text/safe-text';

/** How a step is written: which unit system the numbers are shown in. */
export interface TakeoffKatexOptions {
  /** 'si' (default): m, kPa, kN/m, kN. 'us': ft, psf, plf, kip. */
  system?: UnitSystemId;
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

/** A number with its unit as KaTeX source, in the chosen unit system. */
function quantity(v: TakeoffValue, system: UnitSystemId, withUnit = true): string {
  if (v.unit === '%') return `${numberFormat(v.value, 1, { asciiMinus: true })}${withUnit ? '\\,\\%' : ''}`;
  if (v.unit === '1') return numberFormat(v.value, 4, { asciiMinus: true });
  const q = QUANTITY_OF[v.unit];
  const unit: Unit = q ? UNIT_SYSTEMS[system][q] : (v.unit as Unit);
  const shown = unitFromBase(v.value, unit);
  const digits = numberFormat(shown, UNIT_DECIMALS[unit], { asciiMinus: true });
  if (!withUnit) return digits;
  return `${digits}\\,${KATEX_UNIT[unit] ?? `\\mathrm{${unit}}`}`;
}

function find(step: TakeoffStep, key: string): TakeoffValue {
  const v = step.values.find((x) => x.key === key);
  if (!v) throw new Error(`Takeoff step ${step.id} has no value "${key}".`);
  return v;
}

/** Plain text (a joint tag, a remark) inside KaTeX: the one shared escaping function. */
const text = texText;

/**
 * KaTeX source for one takeoff step, with every number substituted and its unit written
 * (display mode; lines separated inside an `aligned` environment).
 */
export function takeoffStepKatex(step: TakeoffStep, options: TakeoffKatexOptions = {}): string {
  const system = options.system ?? 'si';
  const q = (key: string, withUnit = true) => quantity(find(step, key), system, withUnit);
  const m = (metres: number) => quantity({ key: '', symbol: '', label: '', value: metres, unit: 'm' }, system);
  switch (step.kind) {
    case 'purlin-width': {
      const tag = text(step.jointTag);
      const halvesSloped = step.halves.map((h) => `\\tfrac{1}{2}(${m(2 * h.sloped)})`).join(' + ');
      const halvesPlan = step.halves.map((h) => `\\tfrac{1}{2}(${m(2 * h.plan)})`).join(' + ');
      return [
        '\\begin{aligned}',
        `b_{s,${tag}} &= ${halvesSloped} = ${q('widthSlope')} \\\\`,
        `b_{p,${tag}} &= ${halvesPlan} = ${q('widthPlan')}`,
        '\\end{aligned}',
      ].join('\n');
    }
    case 'purlin-beam': {
      const k = step.trussIndex;
      const left = k > 0 ? `L_{${k}}` : '';
      const right = k < step.spans.length ? `L_{${k + 1}}` : '';
      const tributary = [left, right].filter(Boolean).map((s) => `\\tfrac{1}{2}${s}`).join(' + ');
      return [
        '\\begin{aligned}',
        `&L_i M_{i-1} + 2(L_i + L_{i+1}) M_i + L_{i+1} M_{i+1} = -\\tfrac{1}{4}\\left(w L_i^3 + w L_{i+1}^3\\right), \\quad M_0 = M_{${step.spans.length}} = 0 \\\\`,
        `&R = c\\,w, \\quad c_{\\mathrm{exact}} = ${q('exactPerUnit')} \\quad ${text('(three-moment equation)')} \\\\`,
        `&c_{\\mathrm{trib}} = ${tributary} = ${q('tributaryPerUnit')} \\quad ${text('(tributary length)')}`,
        '\\end{aligned}',
      ].join('\n');
    }
    case 'line-load': {
      const b = step.basis === 'slope' ? 'b_{s}' : 'b_{p}';
      const lines = [`w &= q\\,${b} = ${q('q')} \\times ${q('width')} = ${q('w')}`];
      if (step.values.some((v) => v.key === 'qPlan')) {
        lines.push(`q_{p} &= w / b_{p} = q / \\cos\\theta = ${q('qPlan')} \\quad ${text('(the same load per unit area of plan)')}`);
      }
      return ['\\begin{aligned}', lines.join(' \\\\\n'), '\\end{aligned}'].join('\n');
    }
    case 'purlin-reaction': {
      const tag = text(step.jointTag);
      const lines = [
        `R_{\\mathrm{exact}} &= c_{\\mathrm{exact}}\\,w = ${q('exactPerUnit')} \\times ${q('w')} = ${q('exact')}`,
        `R_{\\mathrm{trib}} &= c_{\\mathrm{trib}}\\,w = ${q('tributaryPerUnit')} \\times ${q('w')} = ${q('tributary')}`,
      ];
      if (step.differencePct !== null) {
        lines.push(`\\Delta &= \\frac{R_{\\mathrm{trib}} - R_{\\mathrm{exact}}}{R_{\\mathrm{exact}}} = ${q('differencePct')}`);
      }
      const chosen = step.chosen === 'exact' ? 'R_{\\mathrm{exact}}' : 'R_{\\mathrm{trib}}';
      lines.push(`P_{${tag},y} &= -${chosen} = ${q('fy')}`);
      return ['\\begin{aligned}', lines.join(' \\\\\n'), '\\end{aligned}'].join('\n');
    }
  }
}

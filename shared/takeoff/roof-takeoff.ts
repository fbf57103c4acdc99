import type { Joint, JointLoad, LoadCategory } from '@shared/model/truss';
import { continuousBeamSolve, continuousBeamTributary } from './continuous-beam';
import { TakeoffError } from './errors';
import { governingSpanPattern, type SpanPattern } from './span-patterns';
import {
  takeoffIdPart,
  type LineLoadStep,
  type PurlinBeamStep,
  type PurlinReactionStep,
  type PurlinWidthStep,
  type SpanPatternStep,
  type TakeoffStep,
  type WindHalf,
  type WindPurlinStep,
} from './steps';

/** Which area a load is given per: m² of roof slope, or m² of horizontal projection (plan). */
export type LoadBasis = 'slope' | 'plan';
/** Which purlin reaction feeds the truss: the continuous-beam value or the tributary-length one. */
export type TakeoffMethod = 'exact' | 'tributary';

/** An area load of one load case. */
export interface AreaLoad {
  /** The load case the joint loads go to (one area load per case). */
  caseId: string;
  /**
   * kPa (kN/m²), acting vertically, downward positive (negative for uplift). Loads normal to the
   * roof surface (wind pressure) are not handled by this takeoff: they need fx ≠ 0.
   */
  q: number;
  basis: LoadBasis;
  /** The case's category, when known: pattern loading is refused for any but live, roof live and snow. */
  category?: LoadCategory;
  /**
   * Check the unfavourable span patterns of the continuous purlin (ASCE/SEI 7-16 §4.3.3 partial
   * loading, §7.5 partial snow loading): the reaction on the chosen truss is the largest downward
   * one over every pattern of loaded and unloaded spans (span-patterns.ts).
   */
  patterns?: boolean;
}

/** Categories whose load may sit on some spans and not others (partial loading). */
export const PATTERN_CATEGORIES: readonly LoadCategory[] = ['roof-live', 'live', 'snow'];

/**
 * Bounds of the wind input (common practice, no source: chosen by us far outside design values;
 * a velocity pressure of 50 kPa is a wind speed near 290 m/s).
 */
export const WIND_LIMITS = { qMaxKpa: 50, cMax: 5 } as const;

/**
 * Wind normal to the roof surface. Each roof panel (between neighbouring purlins) faces left or
 * right of the ridge: a panel rising towards +x is on the left slope, one falling towards +x on
 * the right slope; a level panel takes the windward coefficient. The pressure q·c acts on the
 * sloped area, normal to the panel, positive towards the surface (pressure) and negative away
 * from it (suction).
 */
export interface WindLoad {
  /** The wind load case the joint loads go to. */
  caseId: string;
  /** Its category, when known: must be 'wind'. */
  category?: LoadCategory;
  /** kPa, velocity pressure, > 0. */
  q?: number | null;
  /** Which slope the wind blows onto: 'left' (the slope on the −x side of the ridge) or 'right'. */
  windward: 'left' | 'right';
  /** Pressure coefficient of the windward slope (+ pressure, − suction). */
  cWindward?: number | null;
  /** Pressure coefficient of the leeward slope. */
  cLeeward?: number | null;
}

/** What the engineer enters in the roof-takeoff form. */
export interface RoofTakeoffInput {
  /** The truss's joints (m, y up). */
  joints: Joint[];
  /** Ids of the top-chord joints; purlins may only sit on these. */
  topChordJoints: string[];
  /**
   * Ids of the joints where purlins bear, in order along the roof (eave → ridge, or eave →
   * ridge → eave across both slopes). Default: every top-chord joint in the given order.
   */
  purlinJoints?: string[];
  areaLoads: AreaLoad[];
  /** Wind normal to the roof, into its own wind load case; none when absent or null. */
  wind?: WindLoad | null;
  /** Truss spacing, m: one value for equal spacing, or the trussCount − 1 spacings in order. */
  spacing: number | number[];
  /** Number of trusses the purlins run over (≥ 2). */
  trussCount: number;
  /** Which truss is being designed, from 0 (first end truss) to trussCount − 1 (last end truss). */
  trussIndex: number;
  method: TakeoffMethod;
}

/** A purlin's place and tributary widths. */
export interface TakeoffPurlin {
  joint: string;
  tag: string;
  /** m */
  x: number;
  y: number;
  /** m, along the slope. */
  widthSlope: number;
  /** m, horizontal projection. */
  widthPlan: number;
}

/** One purlin's numbers in one load case. */
export interface TakeoffPurlinCase {
  joint: string;
  tag: string;
  /** m, the width the area load acts on (per its basis). */
  width: number;
  /** kN/m, downward positive. */
  w: number;
  /** kN, reaction of the continuous purlin on the chosen truss, upward on the purlin. */
  exact: number;
  /** kN, the same by tributary length. */
  tributary: number;
  /** (tributary − exact) / exact × 100; null when the exact reaction is 0. */
  differencePct: number | null;
}

/** The takeoff of one load case. */
export interface TakeoffCase {
  caseId: string;
  /** kPa */
  q: number;
  basis: LoadBasis;
  purlins: TakeoffPurlinCase[];
  /** Joint loads on the chosen truss by the chosen method (fx = 0, fy = −reaction, kN). */
  loads: JointLoad[];
  /** The governing span pattern, when the case asked for pattern loading. */
  pattern?: { label: string; loaded: boolean[]; exactPerUnit: number; tributaryPerUnit: number };
}

/** One purlin's wind numbers. */
export interface TakeoffWindPurlin {
  joint: string;
  tag: string;
  /** kN/m, line load on the purlin (+x right, +y up). */
  wx: number;
  wy: number;
  /** kN, the joint load on the truss by the chosen method. */
  fx: number;
  fy: number;
}

/** The wind takeoff. */
export interface TakeoffWind {
  caseId: string;
  /** kPa */
  q: number;
  windward: 'left' | 'right';
  cWindward: number | null;
  cLeeward: number | null;
  purlins: TakeoffWindPurlin[];
  loads: JointLoad[];
}

/** Everything the takeoff found; `steps` hold every number for the calc sheet. */
export interface RoofTakeoffResult {
  method: TakeoffMethod;
  trussIndex: number;
  trussCount: number;
  trussPosition: 'end' | 'interior';
  /** m */
  spans: number[];
  /** m: the chosen truss's reaction per 1 kN/m of purlin line load, exact and tributary. */
  exactPerUnit: number;
  tributaryPerUnit: number;
  purlins: TakeoffPurlin[];
  cases: TakeoffCase[];
  /** Wind normal to the roof, when given. */
  wind: TakeoffWind | null;
  /** Case id → joint loads for the chosen method. */
  caseLoads: Record<string, JointLoad[]>;
  steps: TakeoffStep[];
}

function assertFinite(value: unknown, what: string): asserts value is number {
  if (typeof value !== 'number' || !Number.isFinite(value)) {
    throw new TakeoffError('non-finite-value', `${what} is ${String(value)}; enter a finite number.`);
  }
}

function spansFrom(input: RoofTakeoffInput): number[] {
  const { spacing, trussCount, trussIndex } = input;
  assertFinite(trussCount, 'The truss count');
  if (!Number.isInteger(trussCount) || trussCount < 2) {
    throw new TakeoffError(
      'truss-count-too-small',
      `The truss count is ${trussCount}; a purlin continuous over trusses needs a whole number of at least 2 trusses.`,
    );
  }
  assertFinite(trussIndex, 'The truss index');
  if (!Number.isInteger(trussIndex) || trussIndex < 0 || trussIndex >= trussCount) {
    throw new TakeoffError(
      'truss-index-out-of-range',
      `Truss index ${trussIndex} is not one of the ${trussCount} trusses; choose 0 to ${trussCount - 1} (0 and ${
        trussCount - 1
      } are the end trusses).`,
    );
  }
  const spans = Array.isArray(spacing) ? [...spacing] : new Array<number>(trussCount - 1).fill(spacing);
  if (spans.length !== trussCount - 1) {
    throw new TakeoffError(
      'spacing-count-mismatch',
      `${trussCount} trusses have ${trussCount - 1} spacings, but ${spans.length} were given; list one spacing between each pair of neighbouring trusses.`,
    );
  }
  spans.forEach((s, i) => {
    const which = Array.isArray(spacing) ? `Spacing ${i + 1} (between trusses ${i} and ${i + 1})` : 'The truss spacing';
    assertFinite(s, which);
    if (s <= 0) {
      throw new TakeoffError('spacing-not-positive', `${which} is ${s} m; a spacing must be greater than 0 m.`);
    }
  });
  return spans;
}

function purlinJointsFrom(input: RoofTakeoffInput): Joint[] {
  if (!Array.isArray(input.joints) || !Array.isArray(input.topChordJoints)) {
    throw new TakeoffError('unknown-joint', 'The roof loading needs the truss joints and the list of top-chord joints; pick the top chord on the drawing.');
  }
  if (input.purlinJoints !== undefined && !Array.isArray(input.purlinJoints)) {
    throw new TakeoffError('too-few-purlins', 'The purlin joints must be a list of joint ids in order along the roof.');
  }
  const byId = new Map<string, Joint>();
  for (const joint of input.joints) {
    assertFinite(joint.x, `The x coordinate of joint ${joint.tag}`);
    assertFinite(joint.y, `The y coordinate of joint ${joint.tag}`);
    byId.set(joint.id, joint);
  }
  const topChord = new Set<string>();
  for (const id of input.topChordJoints) {
    if (!byId.has(id)) {
      throw new TakeoffError('unknown-joint', `Top-chord joint "${id}" is not a joint of this truss; pick joints from the drawing.`);
    }
    topChord.add(id);
  }
  const ids = input.purlinJoints ?? input.topChordJoints;
  const seen = new Set<string>();
  const purlins = ids.map((id) => {
    const joint = byId.get(id);
    if (!joint) {
      throw new TakeoffError('unknown-joint', `Purlin joint "${id}" is not a joint of this truss; pick joints from the drawing.`);
    }
    if (!topChord.has(id)) {
      throw new TakeoffError(
        'purlin-not-on-top-chord',
        `Joint ${joint.tag} is not a top-chord joint; purlins bear on the top chord, so pick a top-chord joint or add ${joint.tag} to the top chord.`,
      );
    }
    if (seen.has(id)) {
      throw new TakeoffError('duplicate-purlin', `Joint ${joint.tag} is listed twice as a purlin joint; list each purlin once.`);
    }
    seen.add(id);
    return joint;
  });
  if (purlins.length < 2) {
    throw new TakeoffError(
      'too-few-purlins',
      `${purlins.length} purlin joint(s) given; tributary widths need at least two purlins (half the distance to each neighbour).`,
    );
  }
  // Tributary widths are only right when neighbours in the list are neighbours on the roof.
  const direction = Math.sign(purlins[1].x - purlins[0].x);
  for (let i = 1; i < purlins.length; i++) {
    const step = Math.sign(purlins[i].x - purlins[i - 1].x);
    if (step === 0 || step !== direction) {
      throw new TakeoffError(
        'purlins-out-of-order',
        `Purlin joints ${purlins[i - 1].tag} and ${purlins[i].tag} are out of order along the roof; list the purlins in order from one eave (strictly increasing or decreasing x).`,
      );
    }
  }
  return purlins;
}

function areaLoadsFrom(input: RoofTakeoffInput): AreaLoad[] {
  const areaLoads = Array.isArray(input.areaLoads) ? input.areaLoads : [];
  if (areaLoads.length === 0 && !input.wind) {
    throw new TakeoffError('no-area-loads', 'No area loads given; enter at least one load case with its area load q in kPa, or a wind pressure.');
  }
  const seen = new Set<string>();
  for (const load of areaLoads) {
    if (typeof load.caseId !== 'string' || load.caseId.trim() === '') {
      throw new TakeoffError('missing-load-case', 'An area load has no load case; choose the load case it belongs to.');
    }
    if (seen.has(load.caseId)) {
      throw new TakeoffError(
        'duplicate-load-case',
        `Load case "${load.caseId}" has more than one area load; give each area load its own load case (cases of the same category are combined).`,
      );
    }
    seen.add(load.caseId);
    assertFinite(load.q, `The area load of case "${load.caseId}"`);
    if (load.basis !== 'slope' && load.basis !== 'plan') {
      throw new TakeoffError(
        'unknown-basis',
        `The area load of case "${load.caseId}" has basis "${String(load.basis)}"; use 'slope' (per m² of roof) or 'plan' (per m² of horizontal projection).`,
      );
    }
    if (load.patterns === true && load.category !== undefined && !PATTERN_CATEGORIES.includes(load.category)) {
      throw new TakeoffError(
        'pattern-not-allowed',
        `Load case "${load.caseId}" is a ${load.category} case, and span patterns are checked only for roof live, live and snow load (ASCE/SEI 7-16 4.3.3, 7.5); untick "check unfavourable span patterns" for it.`,
      );
    }
  }
  return areaLoads;
}

const given = (v: number | null | undefined): v is number => v !== null && v !== undefined;

/** Checks the wind input; returns it with q in kPa, or null when there is none. */
function windFrom(input: RoofTakeoffInput, areaLoads: AreaLoad[]): (WindLoad & { q: number }) | null {
  const wind = input.wind;
  if (wind === undefined || wind === null) return null;
  if (typeof wind.caseId !== 'string' || wind.caseId.trim() === '') {
    throw new TakeoffError('missing-load-case', 'The wind pressure has no load case; choose the wind load case it belongs to.');
  }
  for (const [key, name] of [['cWindward', 'windward'], ['cLeeward', 'leeward']] as const) {
    const c = wind[key];
    if (!given(c)) continue;
    if (typeof c !== 'number' || !Number.isFinite(c)) {
      throw new TakeoffError('wind-value-not-finite', `The ${name} pressure coefficient is ${String(c)}; enter a finite number (positive for pressure, negative for suction).`);
    }
    if (Math.abs(c) > WIND_LIMITS.cMax) {
      throw new TakeoffError(
        'wind-coefficient-out-of-range',
        `The ${name} pressure coefficient is ${c}; a roof pressure coefficient lies between −${WIND_LIMITS.cMax} and ${WIND_LIMITS.cMax}, so check the value.`,
      );
    }
  }
  const anyCoefficient = given(wind.cWindward) || given(wind.cLeeward);
  if (!given(wind.q)) {
    if (anyCoefficient) {
      throw new TakeoffError('wind-without-pressure', 'A wind pressure coefficient is given without a velocity pressure q; enter q, or clear the coefficients.');
    }
    throw new TakeoffError('wind-without-pressure', 'The wind section has no velocity pressure q; enter q and the slope coefficients, or remove the wind.');
  }
  if (typeof wind.q !== 'number' || !Number.isFinite(wind.q)) {
    throw new TakeoffError('wind-value-not-finite', `The velocity pressure q is ${String(wind.q)}; enter a finite pressure greater than 0.`);
  }
  if (wind.q <= 0 || wind.q > WIND_LIMITS.qMaxKpa) {
    throw new TakeoffError(
      'wind-pressure-out-of-range',
      `The velocity pressure q is ${wind.q} kPa; it must be greater than 0 and at most ${WIND_LIMITS.qMaxKpa} kPa (1 044 psf), so check the value and its unit.`,
    );
  }
  if (!anyCoefficient) {
    throw new TakeoffError('wind-without-coefficients', 'A velocity pressure q is given without pressure coefficients; enter the windward and leeward coefficients.');
  }
  if (wind.windward !== 'left' && wind.windward !== 'right') {
    throw new TakeoffError('unknown-windward-side', `The windward side is "${String(wind.windward)}"; choose 'left' or 'right' of the ridge.`);
  }
  if (wind.category !== undefined && wind.category !== 'wind') {
    throw new TakeoffError(
      'wind-case-not-wind',
      `Load case "${wind.caseId}" is a ${wind.category} case; put the wind pressure into a wind load case so the combinations treat it as wind.`,
    );
  }
  if (areaLoads.some((l) => l.caseId === wind.caseId)) {
    throw new TakeoffError(
      'duplicate-load-case',
      `Load case "${wind.caseId}" has both an area load and the wind pressure; give the wind its own wind load case.`,
    );
  }
  return { ...wind, q: wind.q };
}

const value = (key: string, symbol: string, label: string, v: number, unit: PurlinWidthStep['values'][number]['unit']) => ({
  key,
  symbol,
  label,
  value: v,
  unit,
});

/**
 * Roof loading: area loads → purlin line loads → continuous-purlin reactions on the chosen
 * truss → joint loads.
 *
 * - Tributary width of a purlin: half the distance to each neighbouring purlin, along the slope
 *   (an end purlin, at the eave or a mono-pitch ridge, takes half its one neighbour distance);
 *   its horizontal projection is the same halves measured on plan.
 * - Line load w = q × b: b is the sloped width for a load per m² of slope, the plan width for a
 *   load per m² of plan (so a slope load equals a plan load of q / cos θ).
 * - The purlin is a continuous beam over the trusses (spans = spacings, simply supported at the
 *   end trusses); its reaction on the chosen truss is found exactly (three-moment equation) and
 *   by tributary length (half of each adjacent spacing), and their difference is reported.
 * - The joint load on the truss is fx = 0, fy = −R of the chosen method (kN, +y up).
 *
 * @throws TakeoffError for bad input, naming the joint, spacing or load case:
 *   'truss-count-too-small', 'truss-index-out-of-range', 'spacing-not-positive',
 *   'spacing-count-mismatch', 'unknown-joint', 'purlin-not-on-top-chord', 'duplicate-purlin',
 *   'too-few-purlins', 'purlins-out-of-order', 'no-area-loads', 'duplicate-load-case',
 *   'unknown-basis', 'unknown-method', 'non-finite-value'.
 */
export function roofTakeoff(input: RoofTakeoffInput): RoofTakeoffResult {
  if (input.method !== 'exact' && input.method !== 'tributary') {
    throw new TakeoffError('unknown-method', `Method "${String(input.method)}" is unknown; choose 'exact' or 'tributary'.`);
  }
  const spans = spansFrom(input);
  const joints = purlinJointsFrom(input);
  const areaLoads = areaLoadsFrom(input);
  const wind = windFrom(input, areaLoads);
  const { trussIndex, trussCount, method } = input;
  const trussPosition = trussIndex === 0 || trussIndex === trussCount - 1 ? 'end' : 'interior';
  const steps: TakeoffStep[] = [];

  // 1. Tributary widths.
  const purlins: TakeoffPurlin[] = joints.map((joint, index) => {
    const halves = [joints[index - 1], joints[index + 1]]
      .filter((n): n is Joint => n !== undefined)
      .map((n) => ({
        neighbour: n.id,
        neighbourTag: n.tag,
        sloped: Math.hypot(n.x - joint.x, n.y - joint.y) / 2,
        plan: Math.abs(n.x - joint.x) / 2,
      }));
    const widthSlope = halves.reduce((sum, h) => sum + h.sloped, 0);
    const widthPlan = halves.reduce((sum, h) => sum + h.plan, 0);
    steps.push({
      kind: 'purlin-width',
      id: `takeoff/purlin-${takeoffIdPart(joint.id)}/width`,
      caseId: '',
      title: `Purlin at ${joint.tag}: tributary width`,
      joint: joint.id,
      jointTag: joint.tag,
      index,
      halves,
      widthSlope,
      widthPlan,
      values: [
        ...halves.flatMap((h, k) => [
          value(`half${k}Sloped`, `\\tfrac{1}{2}\\,s_{${k + 1}}`, `half the distance ${joint.tag}–${h.neighbourTag} along the slope`, h.sloped, 'm'),
          value(`half${k}Plan`, `\\tfrac{1}{2}\\,\\Delta x_{${k + 1}}`, `half the distance ${joint.tag}–${h.neighbourTag} on plan`, h.plan, 'm'),
        ]),
        value('widthSlope', 'b_{s}', 'tributary width along the slope', widthSlope, 'm'),
        value('widthPlan', 'b_{p}', 'tributary width on plan', widthPlan, 'm'),
      ],
    } satisfies PurlinWidthStep);
    return { joint: joint.id, tag: joint.tag, x: joint.x, y: joint.y, widthSlope, widthPlan };
  });

  // 2. The purlin as a continuous beam, per 1 kN/m (every purlin carries a uniform w over all spans).
  const unit = new Array<number>(spans.length).fill(1);
  const beam = continuousBeamSolve(spans, unit);
  const tributaryPerUnitAll = continuousBeamTributary(spans, unit);
  const exactPerUnit = beam.reactions[trussIndex];
  const tributaryPerUnit = tributaryPerUnitAll[trussIndex];
  steps.push({
    kind: 'purlin-beam',
    id: 'takeoff/purlin-beam',
    caseId: '',
    title: `Purlin continuous over ${trussCount} trusses: reaction on truss ${trussIndex + 1}`,
    spans,
    trussCount,
    trussIndex,
    trussPosition,
    exactPerUnit: beam.reactions,
    tributaryPerUnit: tributaryPerUnitAll,
    momentsPerUnit: beam.supportMoments,
    values: [
      ...spans.map((s, i) => value(`span${i}`, `L_{${i + 1}}`, `spacing between trusses ${i + 1} and ${i + 2}`, s, 'm')),
      value('exactPerUnit', 'c_{\\mathrm{cont}}', 'reaction per 1 kN/m, three-moment equation', exactPerUnit, 'm'),
      value('tributaryPerUnit', 'c_{\\mathrm{trib}}', 'reaction per 1 kN/m, tributary length', tributaryPerUnit, 'm'),
    ],
  } satisfies PurlinBeamStep);

  // 3. Per load case: line loads, reactions, joint loads.
  const cases: TakeoffCase[] = areaLoads.map((load) => {
    const casePart = takeoffIdPart(load.caseId);
    // Pattern loading: the governing span pattern's reaction factors replace the all-spans ones.
    let pattern: SpanPattern | null = null;
    if (load.patterns === true) {
      pattern = governingSpanPattern(spans, trussIndex, load.q < 0 ? -1 : 1);
      steps.push(spanPatternStep(load.caseId, spans, trussIndex, pattern, exactPerUnit));
    }
    const caseExactPerUnit = pattern ? pattern.exactPerUnit : exactPerUnit;
    const caseTributaryPerUnit = pattern ? pattern.tributaryPerUnit : tributaryPerUnit;
    const rows: TakeoffPurlinCase[] = purlins.map((purlin) => {
      const width = load.basis === 'slope' ? purlin.widthSlope : purlin.widthPlan;
      const w = load.q * width;
      const jointPart = takeoffIdPart(purlin.joint);
      steps.push({
        kind: 'line-load',
        id: `takeoff/${casePart}/purlin-${jointPart}/line-load`,
        caseId: load.caseId,
        title: `Purlin at ${purlin.tag}: line load`,
        joint: purlin.joint,
        jointTag: purlin.tag,
        q: load.q,
        basis: load.basis,
        width,
        w,
        values: [
          value('q', 'q', load.basis === 'slope' ? 'area load per m² of slope' : 'area load per m² of plan', load.q, 'kPa'),
          value('width', load.basis === 'slope' ? 'b_{s}' : 'b_{p}', load.basis === 'slope' ? 'tributary width along the slope' : 'tributary width on plan', width, 'm'),
          value('w', 'w', 'line load on the purlin', w, 'kN/m'),
          ...(load.basis === 'slope' && purlin.widthPlan > 0
            ? [
                value('widthPlan', 'b_{p}', 'tributary width on plan', purlin.widthPlan, 'm'),
                value('qPlan', 'q_{p}', 'the same load per m² of plan (q / cos θ)', w / purlin.widthPlan, 'kPa'),
              ]
            : []),
        ],
      } satisfies LineLoadStep);
      const exact = w * caseExactPerUnit;
      const tributary = w * caseTributaryPerUnit;
      const differencePct = exact === 0 ? null : ((tributary - exact) / exact) * 100;
      const chosen = method === 'exact' ? exact : tributary;
      steps.push({
        kind: 'purlin-reaction',
        id: `takeoff/${casePart}/purlin-${jointPart}/reaction`,
        caseId: load.caseId,
        title: `Purlin at ${purlin.tag}: reaction on truss ${trussIndex + 1}`,
        joint: purlin.joint,
        jointTag: purlin.tag,
        w,
        exact,
        tributary,
        differencePct,
        chosen: method,
        fy: -chosen,
        ...(pattern ? { pattern: pattern.label } : {}),
        values: [
          value('w', 'w', 'line load on the purlin', w, 'kN/m'),
          value('exactPerUnit', 'c_{\\mathrm{cont}}', 'reaction per 1 kN/m, three-moment equation', caseExactPerUnit, 'm'),
          value('tributaryPerUnit', 'c_{\\mathrm{trib}}', 'reaction per 1 kN/m, tributary length', caseTributaryPerUnit, 'm'),
          value('exact', 'R_{\\mathrm{cont}}', 'reaction, three-moment equation', exact, 'kN'),
          value('tributary', 'R_{\\mathrm{trib}}', 'reaction, tributary length', tributary, 'kN'),
          ...(differencePct === null
            ? []
            : [value('differencePct', '\\Delta', 'tributary against three-moment', differencePct, '%' as const)]),
          value('fy', 'P_{y}', 'joint load on the truss (+y up)', -chosen, 'kN'),
        ],
      } satisfies PurlinReactionStep);
      return { joint: purlin.joint, tag: purlin.tag, width, w, exact, tributary, differencePct };
    });
    const loads: JointLoad[] = rows.map((row) => ({
      joint: row.joint,
      fx: 0,
      fy: -(method === 'exact' ? row.exact : row.tributary),
      note: `purlin at ${row.tag}, roof loading (${method === 'exact' ? 'continuous purlin' : 'tributary length'}${pattern ? `, ${pattern.label}` : ''})`,
    }));
    return {
      caseId: load.caseId,
      q: load.q,
      basis: load.basis,
      purlins: rows,
      loads,
      ...(pattern
        ? { pattern: { label: pattern.label, loaded: pattern.loaded, exactPerUnit: pattern.exactPerUnit, tributaryPerUnit: pattern.tributaryPerUnit } }
        : {}),
    };
  });

  // 4. Wind normal to the roof surface.
  const windResult = wind ? windTakeoff(wind, joints, method === 'exact' ? exactPerUnit : tributaryPerUnit, method, trussIndex, steps) : null;
  const caseLoads: Record<string, JointLoad[]> = Object.fromEntries(cases.map((c) => [c.caseId, c.loads]));
  if (windResult) caseLoads[windResult.caseId] = windResult.loads;

  return {
    method,
    trussIndex,
    trussCount,
    trussPosition,
    spans,
    exactPerUnit,
    tributaryPerUnit,
    purlins,
    cases,
    wind: windResult,
    caseLoads,
    steps,
  };
}

const PATTERN_NOTE =
  'Partial loading: ASCE/SEI 7-16 4.3.3 (live load at full intensity on part of a member where that is more unfavourable) and 7.5 (partial snow loading of continuous members). The purlin is linear, so the reaction under any pattern of loaded spans is the sum of the loaded spans\' single-span reactions (r₁, r₂, … in the step); loading exactly the spans whose single-span reaction is positive gives the largest downward reaction of all 2ⁿ patterns (which include the three loadings of 7.5.1). Unloaded spans carry no load, which gives at least the reaction with half the balanced snow load on them (conservative).';

function spanPatternStep(caseId: string, spans: number[], trussIndex: number, pattern: SpanPattern, allPerUnit: number): SpanPatternStep {
  const diff = allPerUnit === 0 ? null : ((pattern.exactPerUnit - allPerUnit) / allPerUnit) * 100;
  return {
    kind: 'span-pattern',
    id: `takeoff/${takeoffIdPart(caseId)}/span-pattern`,
    caseId,
    title: `Load case ${caseId}: unfavourable span pattern for truss ${trussIndex + 1} — ${pattern.label}`,
    spans,
    trussIndex,
    loaded: pattern.loaded,
    contributions: pattern.contributions,
    momentsPerUnit: pattern.momentsPerUnit,
    label: pattern.label,
    note: PATTERN_NOTE,
    values: [
      ...spans.map((sp, i) => value(`span${i}`, `L_{${i + 1}}`, `spacing between trusses ${i + 1} and ${i + 2}`, sp, 'm')),
      ...pattern.contributions.map((r, j) => value(`r${j}`, `r_{${j + 1}}`, `reaction per 1 kN/m on span ${j + 1} alone`, r, 'm')),
      value('exactPerUnit', 'c_{\\mathrm{cont}}', `reaction per 1 kN/m, ${pattern.label}, three-moment equation`, pattern.exactPerUnit, 'm'),
      value('tributaryPerUnit', 'c_{\\mathrm{trib}}', `reaction per 1 kN/m, ${pattern.label}, tributary length`, pattern.tributaryPerUnit, 'm'),
      value('allPerUnit', 'c_{\\mathrm{all}}', 'reaction per 1 kN/m, all spans loaded', allPerUnit, 'm'),
      ...(diff === null ? [] : [value('differencePct', '\\Delta_{\\mathrm{all}}', 'pattern against all spans loaded', diff, '%' as const)]),
    ],
  };
}

const WIND_NOTE =
  'Wind pressure q·c normal to each roof panel on its sloped area, positive towards the surface (pressure), negative away from it (suction); θ is the panel\'s angle from +x, positive where it rises to the right. A pressure pushes along the inward normal of its panel: the line load along x is the normal line load times sin θ, along y minus the normal line load times cos θ (+x right, +y up). The purlin carries both components to the trusses like any line load.';

/** Wind on each purlin: the normal line loads of the half panels either side, their components, the joint loads. */
function windTakeoff(
  wind: WindLoad & { q: number },
  joints: Joint[],
  perUnit: number,
  method: TakeoffMethod,
  trussIndex: number,
  steps: TakeoffStep[],
): TakeoffWind {
  const casePart = takeoffIdPart(wind.caseId);
  const coefficient = (side: 'windward' | 'leeward') => (side === 'windward' ? wind.cWindward : wind.cLeeward);
  const purlins = joints.map((joint, index) => {
    const halves: (WindHalf & { c: number; p: number; wn: number; sin: number; cos: number; wx: number; wy: number })[] = [];
    for (const n of [joints[index - 1], joints[index + 1]]) {
      if (!n) continue;
      const [a, b] = n.x < joint.x ? [n, joint] : [joint, n];
      const dx = b.x - a.x;
      const dy = b.y - a.y;
      const length = Math.hypot(dx, dy);
      // Rising towards +x: the slope left of the ridge; falling: right of it; level: windward.
      const slope = dy > 0 ? 'left' : dy < 0 ? 'right' : wind.windward;
      const side: 'windward' | 'leeward' = slope === wind.windward ? 'windward' : 'leeward';
      const c = coefficient(side);
      if (!given(c)) {
        throw new TakeoffError(
          'wind-without-coefficients',
          `The roof panel ${joint.tag}–${n.tag} is on the ${side} slope, which has no pressure coefficient; enter the ${side} coefficient.`,
        );
      }
      const p = wind.q * c;
      const wn = (p * length) / 2;
      const sin = dy / length;
      const cos = dx / length;
      halves.push({ neighbour: n.id, neighbourTag: n.tag, side, dx, dy, length, c, p, wn, sin, cos, wx: wn * sin, wy: -wn * cos });
    }
    const wx = halves.reduce((sum, h) => sum + h.wx, 0);
    const wy = halves.reduce((sum, h) => sum + h.wy, 0);
    const fx = perUnit * wx;
    const fy = perUnit * wy;
    steps.push({
      kind: 'wind-purlin',
      id: `takeoff/${casePart}/purlin-${takeoffIdPart(joint.id)}/wind`,
      caseId: wind.caseId,
      title: `Purlin at ${joint.tag}: wind normal to the roof, resolved into x and y`,
      joint: joint.id,
      jointTag: joint.tag,
      halves: halves.map(({ neighbour, neighbourTag, side, dx, dy, length }) => ({ neighbour, neighbourTag, side, dx, dy, length })),
      chosen: method,
      fx,
      fy,
      note: WIND_NOTE,
      values: [
        value('q', 'q', 'velocity pressure', wind.q, 'kPa'),
        ...halves.flatMap((h, k) => [
          value(`dx${k}`, `\\Delta x_{${k + 1}}`, `run of panel ${joint.tag}–${h.neighbourTag}`, h.dx, 'm'),
          value(`dy${k}`, `\\Delta y_{${k + 1}}`, `rise of panel ${joint.tag}–${h.neighbourTag} (left to right)`, h.dy, 'm'),
          value(`s${k}`, `s_{${k + 1}}`, `length of panel ${joint.tag}–${h.neighbourTag}`, h.length, 'm'),
          value(`half${k}`, `\\tfrac{1}{2}s_{${k + 1}}`, `half the panel ${joint.tag}–${h.neighbourTag}`, h.length / 2, 'm'),
          value(`sin${k}`, `\\sin\\theta_{${k + 1}}`, `sine of the panel angle`, h.sin, '1'),
          value(`cos${k}`, `\\cos\\theta_{${k + 1}}`, `cosine of the panel angle`, h.cos, '1'),
          value(`c${k}`, `c_{${k + 1}}`, `pressure coefficient, ${h.side} slope`, h.c, '1'),
          value(`p${k}`, `p_{${k + 1}}`, `wind pressure normal to the panel`, h.p, 'kPa'),
          value(`wn${k}`, `w_{n,${k + 1}}`, `normal line load from the half panel`, h.wn, 'kN/m'),
          value(`wx${k}`, `w_{x,${k + 1}}`, `its x component`, h.wx, 'kN/m'),
          value(`wy${k}`, `w_{y,${k + 1}}`, `its y component`, h.wy, 'kN/m'),
        ]),
        value('wx', 'w_{x}', 'line load on the purlin, x', wx, 'kN/m'),
        value('wy', 'w_{y}', 'line load on the purlin, y', wy, 'kN/m'),
        value('perUnit', method === 'exact' ? 'c_{\\mathrm{cont}}' : 'c_{\\mathrm{trib}}', `reaction on truss ${trussIndex + 1} per 1 kN/m`, perUnit, 'm'),
        value('fx', 'P_{x}', 'joint load on the truss, x', fx, 'kN'),
        value('fy', 'P_{y}', 'joint load on the truss, y (+y up)', fy, 'kN'),
      ],
    } satisfies WindPurlinStep);
    return { joint: joint.id, tag: joint.tag, wx, wy, fx, fy };
  });
  return {
    caseId: wind.caseId,
    q: wind.q,
    windward: wind.windward,
    cWindward: given(wind.cWindward) ? wind.cWindward : null,
    cLeeward: given(wind.cLeeward) ? wind.cLeeward : null,
    purlins,
    loads: purlins.map((p) => ({
      joint: p.joint,
      fx: p.fx,
      fy: p.fy,
      note: `purlin at ${p.tag}, wind normal to the roof (${method === 'exact' ? 'continuous purlin' : 'tributary length'})`,
    })),
  };
}

import type { Joint, JointLoad } from '@shared/model/truss';
import { continuousBeamSolve, continuousBeamTributary } from './continuous-beam';
import { TakeoffError } from './errors';
import {
  takeoffIdPart,
  type LineLoadStep,
  type PurlinBeamStep,
  type PurlinReactionStep,
  type PurlinWidthStep,
  type TakeoffStep,
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
    throw new TakeoffError('unknown-joint', 'The takeoff needs the truss joints and the list of top-chord joints; pick the top chord on the drawing.');
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
  if (!Array.isArray(input.areaLoads) || input.areaLoads.length === 0) {
    throw new TakeoffError('no-area-loads', 'No area loads given; enter at least one load case with its area load q in kPa.');
  }
  const seen = new Set<string>();
  for (const load of input.areaLoads) {
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
  }
  return input.areaLoads;
}

const value = (key: string, symbol: string, label: string, v: number, unit: PurlinWidthStep['values'][number]['unit']) => ({
  key,
  symbol,
  label,
  value: v,
  unit,
});

/**
 * Roof load takeoff: area loads → purlin line loads → continuous-purlin reactions on the chosen
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
      value('exactPerUnit', 'c_{\\mathrm{exact}}', 'reaction per 1 kN/m, three-moment equation', exactPerUnit, 'm'),
      value('tributaryPerUnit', 'c_{\\mathrm{trib}}', 'reaction per 1 kN/m, tributary length', tributaryPerUnit, 'm'),
    ],
  } satisfies PurlinBeamStep);

  // 3. Per load case: line loads, reactions, joint loads.
  const cases: TakeoffCase[] = areaLoads.map((load) => {
    const casePart = takeoffIdPart(load.caseId);
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
      const exact = w * exactPerUnit;
      const tributary = w * tributaryPerUnit;
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
        values: [
          value('w', 'w', 'line load on the purlin', w, 'kN/m'),
          value('exactPerUnit', 'c_{\\mathrm{exact}}', 'reaction per 1 kN/m, three-moment equation', exactPerUnit, 'm'),
          value('tributaryPerUnit', 'c_{\\mathrm{trib}}', 'reaction per 1 kN/m, tributary length', tributaryPerUnit, 'm'),
          value('exact', 'R_{\\mathrm{exact}}', 'reaction, three-moment equation', exact, 'kN'),
          value('tributary', 'R_{\\mathrm{trib}}', 'reaction, tributary length', tributary, 'kN'),
          ...(differencePct === null
            ? []
            : [value('differencePct', '\\Delta', 'tributary against exact', differencePct, '%' as const)]),
          value('fy', 'P_{y}', 'joint load on the truss (+y up)', -chosen, 'kN'),
        ],
      } satisfies PurlinReactionStep);
      return { joint: purlin.joint, tag: purlin.tag, width, w, exact, tributary, differencePct };
    });
    const loads: JointLoad[] = rows.map((row) => ({
      joint: row.joint,
      fx: 0,
      fy: -(method === 'exact' ? row.exact : row.tributary),
      note: `purlin at ${row.tag}, roof takeoff (${method === 'exact' ? 'continuous purlin' : 'tributary length'})`,
    }));
    return { caseId: load.caseId, q: load.q, basis: load.basis, purlins: rows, loads };
  });

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
    caseLoads: Object.fromEntries(cases.map((c) => [c.caseId, c.loads])),
    steps,
  };
}

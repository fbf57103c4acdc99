/**
 * The roof loading's steps: plain data (ids, values with units) that the calc sheet and the
 * client print; `takeoffStepKatex` (katex.ts) turns any step into KaTeX source.
 *
 * Units: every number in a step's `values` carries its unit. Computing units are m, kPa, kN/m
 * and kN; '%' for percentages and '1' for pure numbers. Loads are gravity-direction magnitudes
 * (downward positive) except the joint load fy, which follows the model (+y up, so fy = −R).
 */

/** A unit of a takeoff value: a computing unit, a percentage or a pure number. */
export type TakeoffUnit = 'm' | 'kPa' | 'kN/m' | 'kN' | 'kN·m' | '%' | '1';

/** One printed number. */
export interface TakeoffValue {
  /** Stable key within the step, e.g. "widthSlope". */
  key: string;
  /** KaTeX source of the symbol, e.g. `b_{s}`. */
  symbol: string;
  /** Plain words, e.g. "tributary width along the slope". */
  label: string;
  value: number;
  unit: TakeoffUnit;
}

interface TakeoffStepBase {
  /** Stable, HTML-anchor-safe id, e.g. "takeoff/D/purlin-C/reaction". */
  id: string;
  /** Load case id the step belongs to ('' for geometry steps shared by all cases). */
  caseId: string;
  /** Short heading for the sheet, e.g. "Purlin at C: tributary width". */
  title: string;
  values: TakeoffValue[];
  /** Plain words printed under the step (a clause, the sign convention), when it needs them. */
  note?: string;
}

/** Half the distance from a purlin to one neighbour, along the slope and on plan. */
export interface TributaryHalf {
  neighbour: string;
  neighbourTag: string;
  /** m, half the straight distance between the two purlin joints. */
  sloped: number;
  /** m, half the horizontal distance between them. */
  plan: number;
}

/** A purlin's tributary width: half the distance to each neighbouring purlin. */
export interface PurlinWidthStep extends TakeoffStepBase {
  kind: 'purlin-width';
  joint: string;
  jointTag: string;
  /** 0 for the first purlin in the given order. */
  index: number;
  /** One half for an end (eave or ridge) purlin, two for the others. */
  halves: TributaryHalf[];
  /** m */
  widthSlope: number;
  /** m */
  widthPlan: number;
}

/** The purlin as a continuous beam over the trusses, per 1 kN/m of line load. */
export interface PurlinBeamStep extends TakeoffStepBase {
  kind: 'purlin-beam';
  /** m, truss spacings = purlin spans. */
  spans: number[];
  trussCount: number;
  trussIndex: number;
  trussPosition: 'end' | 'interior';
  /** m: reaction at each truss per 1 kN/m of line load, three-moment equation. */
  exactPerUnit: number[];
  /** m: the same by tributary lengths (half of each adjacent span). */
  tributaryPerUnit: number[];
  /** m² (kN·m per kN/m): support moments per 1 kN/m, sagging positive. */
  momentsPerUnit: number[];
}

/** Line load on one purlin from one area load: w = q × b. */
export interface LineLoadStep extends TakeoffStepBase {
  kind: 'line-load';
  joint: string;
  jointTag: string;
  /** kPa, downward positive. */
  q: number;
  basis: 'slope' | 'plan';
  /** m: the width q acts on (sloped width for 'slope', plan width for 'plan'). */
  width: number;
  /** kN/m, downward positive. */
  w: number;
}

/** The purlin's reaction on the chosen truss, exact and by tributary length, and the joint load. */
export interface PurlinReactionStep extends TakeoffStepBase {
  kind: 'purlin-reaction';
  joint: string;
  jointTag: string;
  /** kN/m */
  w: number;
  /** kN, upward on the purlin = downward on the truss. */
  exact: number;
  tributary: number;
  /** (tributary − exact) / exact × 100; null when the exact reaction is 0. */
  differencePct: number | null;
  chosen: 'exact' | 'tributary';
  /** kN, the joint load on the truss (+y up): −(chosen reaction). */
  fy: number;
  /** The span pattern the reaction factors are for, in words, when the case is pattern-loaded. */
  pattern?: string;
}

/**
 * The unfavourable span pattern of a pattern-loaded case (roof live, live or snow): the reaction
 * on the chosen truss per 1 kN/m on each span alone, the spans loaded, and the reaction factors.
 */
export interface SpanPatternStep extends TakeoffStepBase {
  kind: 'span-pattern';
  spans: number[];
  trussIndex: number;
  /** Per span, loaded or not (span 0 between trusses 0 and 1). */
  loaded: boolean[];
  /** m: reaction per 1 kN/m on span j alone. */
  contributions: number[];
  /** m² per 1 kN/m: support moments under the governing pattern. */
  momentsPerUnit: number[];
  /** In words, e.g. "spans 2 and 3 loaded". */
  label: string;
}

/** One half of a sloped roof panel next to a purlin, carrying wind normal to its surface. */
export interface WindHalf {
  neighbour: string;
  neighbourTag: string;
  /** Which slope the panel is on and so which coefficient it takes. */
  side: 'windward' | 'leeward';
  /** m: the panel's run and rise from its left end to its right end (dx ≥ 0), and its length. */
  dx: number;
  dy: number;
  length: number;
}

/** Wind normal to the roof on one purlin: the pressure, its normal line load and both components. */
export interface WindPurlinStep extends TakeoffStepBase {
  kind: 'wind-purlin';
  joint: string;
  jointTag: string;
  halves: WindHalf[];
  chosen: 'exact' | 'tributary';
  /** kN, the joint load on the truss (+x right, +y up). */
  fx: number;
  fy: number;
}

export type TakeoffStep = PurlinWidthStep | PurlinBeamStep | LineLoadStep | PurlinReactionStep | SpanPatternStep | WindPurlinStep;

/** Turns any string into a piece that is safe in an HTML id and a URL fragment. */
export function takeoffIdPart(text: string): string {
  return text.replace(/[^A-Za-z0-9_-]/g, '_');
}

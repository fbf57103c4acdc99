import { z } from 'zod';
import type { TrussModel } from '@shared/model/truss';
import { BOUNDS, withinMagnitude } from '@shared/model/bounds';
import type { TrussAnalysis, DeterminacyKind } from '@shared/solver';
import type { RoofTakeoffResult } from '@shared/takeoff';
import type { RunDesign } from '@shared/design/basis';

/**
 * The engineer's workspace API: roof-load takeoff and analysis runs.
 *
 * Routes (all JSON unless said; errors are `{ error: { code, message, fields? } }`):
 *
 * | route | who | body → answer |
 * | --- | --- | --- |
 * | PUT  /api/trusses/:id/model            | engineer | `ModelSaveInput` whose `takeoff` is a {@link TakeoffInput} or null → `TrussModelView` |
 * | POST /api/trusses/:id/takeoff/preview  | engineer | {@link TakeoffInput} → {@link TakeoffPreviewView}; writes nothing |
 * | POST /api/trusses/:id/runs             | engineer | {@link RunCreateInput} → 202 {@link RunSummaryView} (status 'queued', or 'failed' when the saved takeoff no longer fits the truss) |
 * | GET  /api/trusses/:id/runs             | everyone | → {@link RunSummaryView}[] newest first |
 * | GET  /api/runs/:id                     | everyone | → {@link RunView} (results once solved) |
 * | GET  /api/runs/:id/forces.csv          | everyone | → text/csv, columns {@link FORCES_CSV_COLUMNS}; 409 'run-not-solved' before it is solved |
 * | GET  /api/runs/:id/reactions.csv       | everyone | → text/csv, columns {@link REACTIONS_CSV_COLUMNS}; 409 'run-not-solved' before it is solved |
 *
 * Units: lengths m, forces kN, area loads kPa (psf accepted in the takeoff input and converted),
 * line loads kN/m. Member forces tension positive, also marked T / C / 0.
 */

const jointId = z.string().min(1, { error: 'A joint id is empty; pick the joint on the drawing.' });

/** One area load of the takeoff: it writes the joint loads of an existing load case. */
export const takeoffAreaLoadSchema = z.object({
  /** Id of a load case of the model; the takeoff replaces that case's joint loads when a run starts. */
  caseId: z.string().min(1, { error: 'Choose the load case this area load writes.' }).max(40),
  /** Vertical area load, downward positive (negative for uplift), in `unit`. */
  q: withinMagnitude('the area load q', ' kPa (or psf)', BOUNDS.areaLoadKpa),
  unit: z.enum(['kPa', 'psf']).default('kPa'),
  /** 'slope': per m² of roof surface; 'plan': per m² of horizontal projection. */
  basis: z.enum(['slope', 'plan'], { error: "Choose the load basis: 'slope' (per m² of roof) or 'plan' (per m² of horizontal projection)." }),
  /**
   * "Check unfavourable span patterns": for a roof live, live or snow case, the purlin reaction is
   * the largest over every pattern of loaded and unloaded spans (ASCE/SEI 7-16 4.3.3, 7.5). A
   * request for any other category is refused (422 'pattern-not-allowed').
   */
  patterns: z.boolean({ error: 'The span-pattern tick-box is true or false.' }).optional(),
});
export type TakeoffAreaLoad = z.infer<typeof takeoffAreaLoadSchema>;

/**
 * A number as sent. Wind values are only type-checked here: whether they are finite and in range
 * (q > 0 and at most 50 kPa, |c| ≤ 5) and whether they go together is the roof loading's own check,
 * answered 422 with one sentence (shared/takeoff WIND_LIMITS).
 */
const windNumber = (what: string) => z.custom<number>((v) => typeof v === 'number', { error: `Enter ${what} as a number.` });

/**
 * Wind normal to the roof surface, into a wind load case: velocity pressure q (kPa or psf) and a
 * pressure coefficient per slope (+ pressure towards the surface, − suction), the windward slope
 * chosen by its side of the ridge. Acts on the sloped area.
 */
export const takeoffWindSchema = z.object({
  caseId: z.string().min(1, { error: 'Choose the wind load case the wind pressure writes.' }).max(40),
  q: windNumber('the velocity pressure q').nullable().optional(),
  unit: z.enum(['kPa', 'psf']).default('kPa'),
  windward: z.enum(['left', 'right'], { error: "Choose which side of the ridge the wind blows onto: 'left' or 'right'." }),
  cWindward: windNumber('the windward pressure coefficient').nullable().optional(),
  cLeeward: windNumber('the leeward pressure coefficient').nullable().optional(),
});
export type TakeoffWindInput = z.infer<typeof takeoffWindSchema>;

const spacingValue = z
  .number({ error: 'Enter the truss spacing in metres.' })
  .finite()
  .positive({ error: 'The truss spacing must be greater than 0 m.' })
  .max(BOUNDS.spacingM, { error: `The truss spacing is above ${BOUNDS.spacingM} m; check the value and its unit.` });

/**
 * The roof loading as the engineer enters it and as it is saved in the model's `takeoff`:
 * the input of `roofTakeoff` without the joints (those always come from the truss).
 */
export const takeoffInputSchema = z
  .object({
    /** Top-chord joint ids; purlins may only bear on these. */
    topChordJoints: z.array(jointId).min(2, { error: 'Pick at least two top-chord joints.' }).max(10_000),
    /** Purlin joints in order along the roof; default: every top-chord joint in the order given. */
    purlinJoints: z.array(jointId).min(2, { error: 'Pick at least two purlin joints.' }).max(10_000).optional(),
    /** Vertical area loads; may be empty when the takeoff carries wind only. */
    areaLoads: z.array(takeoffAreaLoadSchema).max(20),
    /** Wind normal to the roof; null or absent for none. */
    wind: takeoffWindSchema.nullable().optional(),
    /** m: one value for equal spacing, or the trussCount − 1 spacings in order. */
    spacing: z.union([spacingValue, z.array(spacingValue).min(1).max(1000)]),
    /** Trusses the purlins run over. */
    trussCount: z
      .number({ error: 'Enter the number of trusses.' })
      .int({ error: 'The truss count must be a whole number.' })
      .min(2, { error: 'The truss count must be at least 2: a purlin spans between trusses.' })
      .max(1001),
    /** 0 = first end truss … trussCount − 1 = last end truss. */
    trussIndex: z
      .number({ error: 'Enter which truss this is (0 for the first end truss).' })
      .int({ error: 'The truss index must be a whole number.' })
      .min(0, { error: 'The truss index counts from 0 (the first end truss); it cannot be negative.' }),
    /** Which purlin reaction feeds the joint loads. */
    method: z.enum(['exact', 'tributary'], { error: "Choose 'exact' (continuous purlin, three-moment equation) or 'tributary' (tributary length)." }),
  })
  .superRefine((v, ctx) => {
    if (v.areaLoads.length === 0 && !v.wind) {
      ctx.addIssue({ code: 'custom', path: ['areaLoads'], message: 'Enter at least one area load or a wind pressure.' });
    }
    const seen = new Set<string>();
    v.areaLoads.forEach((l, i) => {
      if (seen.has(l.caseId)) {
        ctx.addIssue({ code: 'custom', path: ['areaLoads', i, 'caseId'], message: `Load case "${l.caseId}" has two area loads; give each its own case.` });
      }
      seen.add(l.caseId);
    });
    // A bad count is reported on its own; the index and spacings are checked against a good one.
    if (!Number.isInteger(v.trussCount) || v.trussCount < 2) return;
    if (v.trussIndex >= v.trussCount) {
      ctx.addIssue({
        code: 'custom',
        path: ['trussIndex'],
        message: `Truss index ${v.trussIndex} is not one of the ${v.trussCount} trusses; choose 0 to ${v.trussCount - 1}.`,
      });
    }
    if (Array.isArray(v.spacing) && v.spacing.length !== v.trussCount - 1) {
      ctx.addIssue({
        code: 'custom',
        path: ['spacing'],
        message: `${v.trussCount} trusses have ${v.trussCount - 1} spacings, but ${v.spacing.length} were given.`,
      });
    }
  });
export type TakeoffInput = z.infer<typeof takeoffInputSchema>;

/** The answer of the takeoff preview: nothing is written. */
export interface TakeoffPreviewView {
  trussId: number;
  /** The model version whose joints were used. */
  modelVersion: number;
  /** The input as validated (defaults filled in). */
  input: TakeoffInput;
  /**
   * Tributary widths (`purlins`), per case the line loads and the exact and tributary purlin
   * reactions with their difference (`cases[].purlins`), the joint loads by the chosen method
   * (`cases[].loads`, fy kN +y up) and every number as a step (`steps`). q is in kPa here.
   */
  result: RoofTakeoffResult;
}

/** Body of POST /api/trusses/:id/runs. */
export const runCreateSchema = z.object({
  /**
   * The model version the engineer is looking at. When given and the saved model has moved on,
   * the run is refused (409 'model-changed') so nobody runs a model they have not seen.
   */
  modelVersion: z.number().int().positive().optional(),
});
export type RunCreateInput = z.infer<typeof runCreateSchema>;

/** queued → running → solved | unstable | failed. */
export type RunStatus = 'queued' | 'running' | 'solved' | 'unstable' | 'failed';
/** What the run is doing now; `fraction` is 0…1 across the phases. */
export interface RunProgress {
  phase: 'queued' | 'solving' | 'storing' | 'done';
  fraction: number;
}

/** A run in a list: no results, enough to show status and staleness. */
export interface RunSummaryView {
  /** The row id, for addresses (/api/runs/:id); not shown to people. */
  id: number;
  trussId: number;
  /** 1, 2, … within the truss: what people see and cite ("Run 2 of T7"). */
  number: number;
  /** Model version the snapshot was taken from. */
  modelVersion: number;
  /** True when the model has been saved since this run (its results no longer match the model). */
  stale: boolean;
  status: RunStatus;
  progress: RunProgress;
  ranById: number | null;
  ranBy: string;
  /** ISO times. */
  createdAt: string;
  startedAt: string | null;
  finishedAt: string | null;
  /** Stability and determinacy; null until solved or when the run failed before it. */
  classification: {
    kind: DeterminacyKind;
    degree: number;
    /** Joints of a mechanism, for an unstable model. */
    mechanismJoints: string[];
    message: string;
  } | null;
  /** Why the run failed: a solver or takeoff error code and its message; null otherwise. */
  error: { code: string; message: string } | null;
  /** Largest joint residual over cases and combinations, kN; null without results. */
  maxResidual: number | null;
  caseCount: number;
  combinationCount: number;
  /** True when the run used the saved roof loading. */
  usedTakeoff: boolean;
  /** The member design checks in brief; null when the model has no member design. */
  design: DesignSummary | null;
}

/** A run's design checks in a line: how many members fail or nearly fail, the largest utilisation. */
export interface DesignSummary {
  standard: string;
  members: number;
  failing: number;
  nearFailing: number;
  maxUtilisation: number;
  /** Tag of the member with the largest utilisation. */
  governingMember: string | null;
  /** Why the checks could not be made. */
  error: string | null;
  /** When the checks were redone on the stored forces without a new analysis. */
  recheckedAt: string | null;
}

/** The stored results: the solver's output and, when the model has a member design, its checks. */
export type RunAnalysis = TrussAnalysis & { design?: RunDesign | null };

/** Body of POST /api/runs/:id/design: re-check a run's members with the saved sections, no new analysis. */
export const designRecheckSchema = z.object({
  /** The model version the engineer is looking at; refused (409) when the saved model moved on. */
  modelVersion: z.number().int().positive().optional(),
});
export type DesignRecheckInput = z.infer<typeof designRecheckSchema>;

/** One run with everything it stored. */
export interface RunView extends RunSummaryView {
  /** The model as solved: the saved model with the roof loading's load cases put in. Immutable. */
  model: TrussModel;
  /** The saved takeoff input and its recomputed result; null when the model has no takeoff. */
  takeoff: { input: TakeoffInput; result: RoofTakeoffResult } | null;
  /**
   * The solver's full output (classification, cases, combinations, envelope, symmetry, steps);
   * for an unstable model it holds the classification and no forces; null while queued or
   * running and when the run failed.
   */
  analysis: RunAnalysis | null;
}

/** Header of GET /api/runs/:id/forces.csv, one row per member per case, combination and envelope line. */
export const FORCES_CSV_COLUMNS = ['source', 'name', 'member', 'group', 'from', 'to', 'force_kN', 'sense', 'governing'] as const;

/**
 * Header of GET /api/runs/:id/reactions.csv: one row per support per load case and combination
 * (rx and ry), then four envelope rows per support ('rx max', 'rx min', 'ry max', 'ry min', the
 * value in its own column, the other column empty, `governing` naming the combination or case).
 * kN, +x right, +y up; `uplift` is 'yes' where ry < 0 (the support must hold the truss down).
 */
export const REACTIONS_CSV_COLUMNS = ['source', 'name', 'support', 'kind', 'rx_kN', 'ry_kN', 'governing', 'uplift'] as const;

import type { LoadCase, TrussModel } from '@shared/model/truss';
import { takeoffInputSchema, type TakeoffInput } from '@shared/schemas/run.schema';
import { roofTakeoff, TAKEOFF_UNPROCESSABLE, TakeoffError, type RoofTakeoffInput, type RoofTakeoffResult } from '@shared/takeoff';
import { unitConvert } from '@shared/units';
import { AppError } from '../../errors/app-error';

/**
 * The shared takeoff's input for a saved takeoff on a truss: joints from the model, q in kPa,
 * each case's category from `loadCases` (the cases being saved, or the model's) where it is there.
 */
export function takeoffRoofInput(model: TrussModel, input: TakeoffInput, loadCases: readonly Pick<LoadCase, 'id' | 'category'>[] = model.loadCases): RoofTakeoffInput {
  const category = new Map(loadCases.map((c) => [c.id, c.category]));
  const kpa = (q: number, unit: 'kPa' | 'psf') => (unit === 'psf' ? unitConvert(q, 'psf', 'kPa') : q);
  const wind = input.wind;
  return {
    joints: model.joints,
    topChordJoints: input.topChordJoints,
    ...(input.purlinJoints ? { purlinJoints: input.purlinJoints } : {}),
    areaLoads: input.areaLoads.map((l) => ({
      caseId: l.caseId,
      q: kpa(l.q, l.unit),
      basis: l.basis,
      ...(category.has(l.caseId) ? { category: category.get(l.caseId) } : {}),
      ...(l.patterns !== undefined ? { patterns: l.patterns } : {}),
    })),
    ...(wind
      ? {
          wind: {
            caseId: wind.caseId,
            ...(category.has(wind.caseId) ? { category: category.get(wind.caseId) } : {}),
            q: wind.q === null || wind.q === undefined ? null : kpa(wind.q, wind.unit),
            windward: wind.windward,
            cWindward: wind.cWindward ?? null,
            cLeeward: wind.cLeeward ?? null,
          },
        }
      : {}),
    spacing: input.spacing,
    trussCount: input.trussCount,
    trussIndex: input.trussIndex,
    method: input.method,
  };
}

/**
 * Refuses a takeoff whose area loads write load cases the model does not have. The takeoff
 * fills existing cases (so combinations can name them); it never invents one.
 */
export function assertTakeoffCases(input: TakeoffInput, loadCases: readonly Pick<LoadCase, 'id'>[]): void {
  const ids = new Set(loadCases.map((c) => c.id));
  for (const l of [...input.areaLoads, ...(input.wind ? [input.wind] : [])]) {
    if (!ids.has(l.caseId)) {
      throw new AppError(
        'unknown-load-case',
        `The roof loading writes load case "${l.caseId}", which the model does not have. Add that load case first, or choose one of: ${[...ids].join(', ') || '(none yet)'}.`,
        400,
      );
    }
  }
}

/**
 * Runs the roof loading against the model's joints. A takeoff error (purlin off the top chord,
 * unknown joint, …) becomes a 400 that keeps the roof loading's code and message; wind and span-pattern
 * input that cannot be taken off as asked (a coefficient without q, a pattern on a dead case, q or
 * a coefficient not finite or out of range) a 422.
 */
export function computeTakeoff(model: TrussModel, input: TakeoffInput, loadCases?: readonly Pick<LoadCase, 'id' | 'category'>[]): RoofTakeoffResult {
  try {
    return roofTakeoff(takeoffRoofInput(model, input, loadCases));
  } catch (err) {
    if (err instanceof TakeoffError) throw new AppError(err.code, err.message, TAKEOFF_UNPROCESSABLE.has(err.code) ? 422 : 400);
    throw err;
  }
}

/**
 * Reads the takeoff kept in a model's `takeoff` column. It was validated when saved; a text
 * that no longer parses (saved before validation existed) is refused with a way out.
 */
export function takeoffParseStored(text: string | null): TakeoffInput | null {
  if (!text) return null;
  const stored: unknown = JSON.parse(text);
  // Models saved with their takeoff removed once kept the text 'null': that is no takeoff.
  if (stored === null) return null;
  const parsed = takeoffInputSchema.safeParse(stored);
  if (parsed.success) return parsed.data;
  throw new AppError(
    'saved-takeoff-unreadable',
    'The roof loading saved with this model is not in a form this server reads. Open the roof loading form, check its values and save it again.',
    400,
  );
}

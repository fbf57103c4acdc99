import type { TakeoffInput, TakeoffPreviewView } from '@shared/schemas/run.schema';
import { getModel } from '../models/models.service';
import { computeTakeoff } from './takeoff-compute';

/**
 * Computes the takeoff for given inputs against the truss's current joints; writes nothing.
 * The load cases need not exist yet: the save checks that.
 */
export async function previewTakeoff(trussId: number, input: TakeoffInput): Promise<TakeoffPreviewView> {
  const view = await getModel(trussId);
  return { trussId, modelVersion: view.version, input, result: computeTakeoff(view.model, input) };
}

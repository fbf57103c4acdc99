import { z } from 'zod';
import { combinationSchema, loadCaseSchema, memberSchema, supportSchema } from '@shared/model/truss';
import { takeoffInputSchema } from '@shared/schemas/run.schema';
import { designInputSchema } from '@shared/model/design-input';

/**
 * What an engineer saves: supports, loads, combinations and member properties. Geometry
 * comes only from the drawing, so joints are not sent; members are sent for their
 * properties and matched by id.
 */
export const modelSaveSchema = z.object({
  version: z.number().int().positive(),
  supports: z.array(supportSchema),
  loadCases: z.array(loadCaseSchema),
  combinations: z.array(combinationSchema),
  members: z.array(memberSchema.pick({ id: true, group: true, E: true, A: true, EA: true, material: true, section: true })),
  /** The roof loading's inputs; null removes it, leaving it out keeps the saved one. */
  takeoff: takeoffInputSchema.nullable().optional(),
});
export type ModelSaveInput = z.infer<typeof modelSaveSchema>;

/**
 * Body of PUT /api/trusses/:id/design: the member design saved with the model (a new model
 * version); null removes it.
 */
export const designSaveSchema = z.object({
  version: z.number({ error: 'Send the model version you edited.' }).int().positive(),
  design: designInputSchema.nullable(),
});
export type DesignSaveInput = z.infer<typeof designSaveSchema>;

/** Body of POST /api/trusses/:id/model/detach-loads: the model save edited and the case whose roof-takeoff loads become hand loads. */
export const detachLoadsSchema = z.object({
  version: z.number({ error: 'Send the model save you edited as a number.' }).int().positive(),
  caseId: z.string({ error: 'Name the load case to detach.' }).min(1, { error: 'Name the load case to detach.' }).max(40),
});
export type DetachLoadsInput = z.infer<typeof detachLoadsSchema>;

import { z } from 'zod';
import { BOUNDS, withinMagnitude, withinRange } from './bounds';
import { designInputSchema } from './design-input';

/**
 * The truss model every part of Panelpoint speaks: the drawing import produces its geometry,
 * the engineer adds supports, properties and loads, the solver reads it.
 *
 * Units: lengths in metres, forces in kN, E in kN/m² (kPa), A in m², EA in kN.
 * Coordinates: x to the right, y up. Loads: fy positive up (a gravity load has fy < 0).
 */

export const jointSchema = z.object({
  id: z.string().min(1),
  tag: z.string().min(1),
  x: withinMagnitude('a joint’s x coordinate', ' m', BOUNDS.coordinateM),
  y: withinMagnitude('a joint’s y coordinate', ' m', BOUNDS.coordinateM),
});
export type Joint = z.infer<typeof jointSchema>;

export const memberGroupSchema = z.enum(['top-chord', 'bottom-chord', 'web', 'other']);
export type MemberGroup = z.infer<typeof memberGroupSchema>;

export const memberSchema = z.object({
  id: z.string().min(1),
  tag: z.string().min(1),
  from: z.string().min(1),
  to: z.string().min(1),
  group: memberGroupSchema.optional(),
  /** Young's modulus, kN/m². */
  E: withinRange("a member's E", ' kN/m²', BOUNDS.E.min, BOUNDS.E.max).optional(),
  /** Cross-section area, m². */
  A: withinRange("a member's area A", ' m²', BOUNDS.A.min, BOUNDS.A.max).optional(),
  /** Axial stiffness EA, kN; wins over E·A when both are given. */
  EA: withinRange("a member's EA", ' kN', BOUNDS.EA.min, BOUNDS.EA.max).optional(),
  material: z.string().max(120).optional(),
  section: z.string().max(120).optional(),
});
export type Member = z.infer<typeof memberSchema>;

export const supportSchema = z.discriminatedUnion('kind', [
  z.object({ joint: z.string().min(1), kind: z.literal('pin') }),
  z.object({
    joint: z.string().min(1),
    kind: z.literal('roller'),
    /** Angle of the reaction line from +x, degrees; 90 = vertical reaction. */
    angleDeg: withinMagnitude("a roller's angle", '°', 360).default(90),
  }),
]);
export type Support = z.infer<typeof supportSchema>;

export const loadCategorySchema = z.enum(['dead', 'live', 'roof-live', 'snow', 'wind', 'other']);
export type LoadCategory = z.infer<typeof loadCategorySchema>;

/** Each load category as the app and the calc sheet write it. */
export const LOAD_CATEGORY_NAMES: Record<LoadCategory, string> = {
  dead: 'Dead',
  live: 'Live',
  'roof-live': 'Roof live',
  snow: 'Snow',
  wind: 'Wind',
  other: 'Other',
};

export const jointLoadSchema = z.object({
  joint: z.string().min(1),
  /** kN, +x to the right. */
  fx: withinMagnitude('a joint load’s fx', ' kN', BOUNDS.jointLoadKn),
  /** kN, +y up. */
  fy: withinMagnitude('a joint load’s fy', ' kN', BOUNDS.jointLoadKn),
  note: z.string().max(200).optional(),
});
export type JointLoad = z.infer<typeof jointLoadSchema>;

export const loadCaseSchema = z.object({
  id: z.string().min(1).max(40),
  name: z.string().min(1).max(120),
  category: loadCategorySchema,
  loads: z.array(jointLoadSchema),
  /**
   * 'roof-loading': the case's loads were written by the roof loading ("Use these loads") and are
   * read-only until detached (shared/model/roof-loads.ts). Absent: loads entered by hand (every
   * model saved before this field existed).
   */
  source: z.literal('roof-loading', { error: "A load case's source is 'roof-loading' or left out." }).optional(),
});
export type LoadCase = z.infer<typeof loadCaseSchema>;

export const combinationSchema = z.object({
  name: z.string().min(1).max(80),
  /** Load case id → factor. */
  factors: z.record(z.string(), withinMagnitude('a combination factor', '', BOUNDS.factor)),
  /** Where the factors come from, e.g. "ASCE/SEI 7-16 §2.3.1 (3)". */
  clause: z.string().max(200).optional(),
});
export type Combination = z.infer<typeof combinationSchema>;

export const trussModelSchema = z.object({
  joints: z.array(jointSchema),
  members: z.array(memberSchema),
  supports: z.array(supportSchema),
  loadCases: z.array(loadCaseSchema),
  combinations: z.array(combinationSchema).default([]),
  /** Member design: basis, groups with material and section, deflection request (shared/model/design-input.ts). */
  design: designInputSchema.optional(),
});
export type TrussModel = z.infer<typeof trussModelSchema>;

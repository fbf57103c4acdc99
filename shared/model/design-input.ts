import { z } from 'zod';
import { withinRange } from './bounds';

/**
 * Member design as the engineer enters it and as it is saved with the truss model (the model's
 * `design` key, so it is versioned with the model and copied into every run's snapshot).
 *
 * Units as the design code works: MPa for strengths and moduli, mm and mm² for sections, m for
 * unbraced lengths (like the model's coordinates). Structure is checked here; the engineering
 * sense of the values (Fu ≥ Fy, a wall thinner than half the diameter, c between 0 and 1, every
 * member covered) by `designBasisOf` in shared/design/basis.ts, each with its own sentence.
 */

/** Bounds far outside real members, there to refuse slips (common practice, no source). */
const mpa = (what: string) => withinRange(what, ' MPa', 1e-3, 1e7);
const mm = (what: string) => withinRange(what, ' mm', 1e-3, 1e5);
const mm2 = (what: string) => withinRange(what, ' mm²', 1e-3, 1e9);
const factor = (what: string) => withinRange(what, '', 0.1, 10);
const metres = (what: string) => withinRange(what, ' m', 1e-3, 10_000);

export const designStandardSchema = z.enum(['aisc360-16-lrfd', 'aisc360-16-asd', 'en1993-1-1', 'nds-2018-asd'], {
  error: 'Choose the design basis: AISC 360-16 LRFD or ASD, EN 1993-1-1, or NDS 2018 (ASD).',
});

export const designMaterialSchema = z.discriminatedUnion(
  'kind',
  [
    z.object({ kind: z.literal('grade'), grade: z.string().min(1).max(40) }),
    z.object({ kind: z.literal('steel'), Fy: mpa('the yield stress Fy'), Fu: mpa('the tensile strength Fu'), E: mpa('the modulus E') }),
    z.object({
      kind: z.literal('timber'),
      name: z.string().max(80).optional(),
      Ft: mpa('the adjusted tension value Ft′'),
      Fc: mpa('the adjusted compression value Fc*'),
      Emin: mpa('the adjusted modulus E′min'),
      E: mpa('the modulus E'),
      c: z.number({ error: 'Enter c of the timber (0.8 sawn lumber, 0.85 poles, 0.9 glulam or SCL).' }).finite(),
    }),
  ],
  { error: "Give the material as a preset steel grade, steel values (Fy, Fu, E) or timber design values; 'kind' is 'grade', 'steel' or 'timber'." },
);
export type DesignMaterialInput = z.infer<typeof designMaterialSchema>;

const tensionExtras = { An: mm2('the net area An').optional(), U: withinRange('the shear-lag factor U', '', 0.01, 1).optional() };
export const designSectionSchema = z.discriminatedUnion(
  'shape',
  [
    z.object({ shape: z.literal('properties'), A: mm2('the area A'), rx: mm('the radius of gyration rx'), ry: mm('the radius of gyration ry'), ...tensionExtras }),
    z.object({ shape: z.literal('rectangle'), b: mm('the width b'), d: mm('the depth d'), ...tensionExtras }),
    z.object({ shape: z.literal('round-hollow'), D: mm('the diameter D'), t: mm('the wall t'), ...tensionExtras }),
    z.object({ shape: z.literal('rect-hollow'), B: mm('the width B'), H: mm('the height H'), t: mm('the wall t'), ...tensionExtras }),
    z.object({ shape: z.literal('angle'), b: mm('the leg b'), d: mm('the leg d'), t: mm('the thickness t'), ...tensionExtras }),
    z.object({
      shape: z.literal('double-angle'),
      b: mm('the leg b'),
      d: mm('the leg d'),
      t: mm('the thickness t'),
      s: z.number({ error: 'Enter the gap s between the angles in mm (0 when they touch).' }).finite().min(0, { error: 'The gap s between the angles cannot be negative.' }).max(1000),
      ...tensionExtras,
    }),
  ],
  { error: "Give the section by its properties or a shape; 'shape' is properties, rectangle, round-hollow, rect-hollow, angle or double-angle." },
);
export type DesignSectionInput = z.infer<typeof designSectionSchema>;

/** Which members a group takes: all, a chord or the webs by the members' group, or member ids. */
export const designSelectionSchema = z.union([
  z.enum(['all', 'top-chord', 'bottom-chord', 'web']),
  z.array(z.string().min(1).max(120)).min(1, { error: 'Pick at least one member for the group.' }).max(100_000),
]);
export type DesignSelection = z.infer<typeof designSelectionSchema>;

export const designGroupInputSchema = z.object({
  name: z.string().trim().min(1, { error: 'Give the design group a name.' }).max(80),
  members: designSelectionSchema,
  material: designMaterialSchema,
  section: designSectionSchema,
  /** Effective-length factors in and out of the plane of the truss (default 1.0). */
  Kx: factor('the effective-length factor Kx').optional(),
  Ky: factor('the effective-length factor Ky').optional(),
  /** Unbraced lengths, m (default: the member length; out of plane from purlin or brace spacing). */
  Lx: metres('the in-plane unbraced length Lx').optional(),
  Ly: metres('the out-of-plane unbraced length Ly').optional(),
  curve: z.enum(['a0', 'a', 'b', 'c', 'd'], { error: 'The buckling curve is one of a0, a, b, c, d (EN 1993-1-1 Table 6.2).' }).optional(),
});
export type DesignGroupInput = z.infer<typeof designGroupInputSchema>;

export const deflectionInputSchema = z.object({
  /** Joint ids. */
  joints: z.array(z.string().min(1)).min(1, { error: 'Pick at least one joint for the deflection.' }).max(20),
  /** Service combinations (or load cases) by name. */
  combinations: z.array(z.string().min(1)).min(1, { error: 'Pick at least one service combination for the deflection.' }).max(20),
  /** Span/deflection, e.g. 240. */
  limit: withinRange('the span/deflection limit', '', 1, 100_000),
});
export type DeflectionInput = z.infer<typeof deflectionInputSchema>;

export const designInputSchema = z.object({
  standard: designStandardSchema,
  /** EN 1993-1-1 partial factors when a National Annex sets other values than recommended. */
  gammaM0: withinRange('γM0', '', 0.5, 3).optional(),
  gammaM1: withinRange('γM1', '', 0.5, 3).optional(),
  gammaM2: withinRange('γM2', '', 0.5, 3).optional(),
  groups: z.array(designGroupInputSchema).min(1, { error: 'Add at least one design group with a material and a section.' }).max(100),
  deflection: deflectionInputSchema.optional(),
});
export type DesignInput = z.infer<typeof designInputSchema>;

import { z } from 'zod';
import {
  combinationSchema,
  LOAD_CATEGORY_NAMES,
  jointLoadSchema,
  loadCaseSchema,
  memberGroupSchema,
  supportSchema,
  type Joint,
  type LoadCategory,
  type MemberGroup,
  type TrussModel,
} from '@shared/model/truss';
import type { TrussModelView } from '@shared/schemas/drawing.schema';
import type { ModelSaveInput } from '@shared/schemas/model.schema';
import { takeoffInputSchema, type TakeoffInput } from '@shared/schemas/run.schema';

/**
 * The model as the workspace edits it. Differences from the saved model, all undone by
 * `draftToSaveInput`: joint loads are one flat list (each naming its case) so one table can
 * list and bulk-edit them; member E is in GPa and A in mm² as engineers write them.
 */

const positiveOptional = (what: string) =>
  z
    .number({ error: `Enter ${what} as a number, or leave it empty.` })
    .finite()
    .positive({ error: `${what[0]!.toUpperCase()}${what.slice(1)} must be greater than 0.` })
    .optional();

export const memberDraftSchema = z.object({
  id: z.string().min(1),
  group: memberGroupSchema.optional(),
  /** GPa (1 GPa = 10⁶ kN/m²). */
  E: positiveOptional('E'),
  /** mm² (1 mm² = 10⁻⁶ m²). */
  A: positiveOptional('the area A'),
  /** kN */
  EA: positiveOptional('EA'),
  material: z.string().max(120).optional(),
  section: z.string().max(120).optional(),
});
export type MemberDraft = z.infer<typeof memberDraftSchema>;

export const draftLoadSchema = jointLoadSchema.extend({
  caseId: z.string().min(1, { error: 'Choose the load case of this load.' }),
  fx: z.number({ error: 'Enter Fx in kN (0 for none).' }).finite(),
  fy: z.number({ error: 'Enter Fy in kN (0 for none; negative is down).' }).finite(),
});
export type DraftLoad = z.infer<typeof draftLoadSchema>;

const draftSupportSchema = z.discriminatedUnion('kind', [
  supportSchema.options[0],
  supportSchema.options[1].extend({
    angleDeg: z.number({ error: 'Enter the angle of the roller’s reaction in degrees from horizontal (90 is straight up).' }).finite(),
  }),
]);

export const modelDraftSchema = z
  .object({
    supports: z.array(draftSupportSchema),
    loadCases: z.array(loadCaseSchema.omit({ loads: true })),
    loads: z.array(draftLoadSchema),
    combinations: z.array(combinationSchema),
    members: z.array(memberDraftSchema),
    takeoff: takeoffInputSchema.nullable(),
  })
  .superRefine((draft, ctx) => {
    const seen = new Set<string>();
    draft.supports.forEach((s, i) => {
      if (seen.has(s.joint)) {
        ctx.addIssue({ code: 'custom', path: ['supports', i, 'joint'], message: 'This joint already has a support; keep one.' });
      }
      seen.add(s.joint);
    });
    const cases = new Set(draft.loadCases.map((c) => c.id));
    draft.loads.forEach((l, i) => {
      if (!cases.has(l.caseId)) {
        ctx.addIssue({ code: 'custom', path: ['loads', i, 'caseId'], message: `Load case "${l.caseId}" does not exist; choose another.` });
      }
    });
    draft.combinations.forEach((c, i) => {
      for (const id of Object.keys(c.factors)) {
        if (!cases.has(id)) {
          ctx.addIssue({ code: 'custom', path: ['combinations', i, 'name'], message: `"${c.name}" has a factor on load case "${id}", which no longer exists.` });
        }
      }
    });
  });
export type ModelDraft = z.infer<typeof modelDraftSchema>;
export type ModelDraftInput = z.input<typeof modelDraftSchema>;

const GPA = 1e6; // kN/m² per GPa
const MM2 = 1e-6; // m² per mm²

// Tidies a float after a unit change: 11 GPa stays 11, not 10.999999999999998.
const tidy = (v: number) => Number(v.toPrecision(12));

/** The saved model (and its takeoff) as a draft for the editor. */
export function draftFromModelView(view: TrussModelView): ModelDraft {
  const m = view.model;
  const parsedTakeoff = view.takeoff ? takeoffInputSchema.safeParse(view.takeoff) : null;
  return {
    supports: m.supports.map((s) => (s.kind === 'roller' ? { ...s, angleDeg: s.angleDeg ?? 90 } : { ...s })),
    loadCases: m.loadCases.map(({ id, name, category, source }) => ({ id, name, category, ...(source ? { source } : {}) })),
    loads: m.loadCases.flatMap((c) => c.loads.map((l) => ({ caseId: c.id, joint: l.joint, fx: l.fx, fy: l.fy, ...(l.note ? { note: l.note } : {}) }))),
    combinations: m.combinations.map((c) => ({ ...c, factors: { ...c.factors } })),
    members: m.members.map((mem) => ({
      id: mem.id,
      group: mem.group,
      E: mem.E === undefined ? undefined : tidy(mem.E / GPA),
      A: mem.A === undefined ? undefined : tidy(mem.A / MM2),
      EA: mem.EA,
      material: mem.material,
      section: mem.section,
    })),
    takeoff: parsedTakeoff?.success ? parsedTakeoff.data : null,
  };
}

const blankToUndefined = (s: string | undefined) => (s === undefined || s.trim() === '' ? undefined : s.trim());

/** The body of PUT /api/trusses/:id/model for a draft, at the version it was loaded from. */
export function draftToSaveInput(draft: ModelDraft, version: number): ModelSaveInput {
  return {
    version,
    supports: draft.supports,
    loadCases: draft.loadCases.map((c) => ({
      ...c,
      loads: draft.loads
        .filter((l) => l.caseId === c.id)
        .map((l) => ({ joint: l.joint, fx: l.fx, fy: l.fy, ...(blankToUndefined(l.note) ? { note: blankToUndefined(l.note) } : {}) })),
    })),
    // Zero factors say nothing; they are left out so the sheet lists only the cases that count.
    combinations: draft.combinations.map((c) => ({
      name: c.name,
      factors: Object.fromEntries(Object.entries(c.factors).filter(([, f]) => Number.isFinite(f) && f !== 0)),
      ...(blankToUndefined(c.clause) ? { clause: blankToUndefined(c.clause) } : {}),
    })),
    members: draft.members.map((m) => ({
      id: m.id,
      ...(m.group ? { group: m.group } : {}),
      ...(m.E !== undefined && Number.isFinite(m.E) ? { E: m.E * GPA } : {}),
      ...(m.A !== undefined && Number.isFinite(m.A) ? { A: m.A * MM2 } : {}),
      ...(m.EA !== undefined && Number.isFinite(m.EA) ? { EA: m.EA } : {}),
      ...(blankToUndefined(m.material) ? { material: blankToUndefined(m.material) } : {}),
      ...(blankToUndefined(m.section) ? { section: blankToUndefined(m.section) } : {}),
    })),
    takeoff: draft.takeoff,
  };
}

/** Load categories as the app writes them. */
export const CATEGORY_LABELS = LOAD_CATEGORY_NAMES;

const CATEGORY_LETTER: Record<LoadCategory, string> = { dead: 'D', live: 'L', 'roof-live': 'Lr', snow: 'S', wind: 'W', other: 'X' };

/** A fresh load case id for a category: D1, D2, … S1, Lr1 (never one already used). */
export function loadCaseIdNext(category: LoadCategory, existing: readonly { id: string }[]): string {
  const used = new Set(existing.map((c) => c.id));
  const letter = CATEGORY_LETTER[category];
  for (let n = 1; ; n++) if (!used.has(`${letter}${n}`)) return `${letter}${n}`;
}

export const GROUP_LABELS: Record<MemberGroup, string> = {
  'top-chord': 'Top chord',
  'bottom-chord': 'Bottom chord',
  web: 'Web',
  other: 'Other',
};

/** Joints of the members grouped as top chord, in order of x (the roof loading's top-chord list). */
export function topChordJoints(model: Pick<TrussModel, 'joints' | 'members'>, groups: ReadonlyMap<string, MemberGroup | undefined>): Joint[] {
  const ids = new Set<string>();
  for (const m of model.members) {
    if (groups.get(m.id) === 'top-chord') {
      ids.add(m.from);
      ids.add(m.to);
    }
  }
  return model.joints.filter((j) => ids.has(j.id)).sort((a, b) => a.x - b.x || a.y - b.y);
}

export type { TakeoffInput };

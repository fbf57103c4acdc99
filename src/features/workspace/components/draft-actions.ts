import type { UseFormReturn } from 'react-hook-form';
import type { LoadCategory, Support } from '@shared/model/truss';
import { CATEGORY_LABELS, loadCaseIdNext, type DraftLoad, type ModelDraft, type ModelDraftInput } from '../utils/model-draft';

export type DraftForm = UseFormReturn<ModelDraftInput, unknown, ModelDraft>;

const DIRTY = { shouldDirty: true, shouldValidate: false } as const;

/** Edits of the draft that several parts of the editor make (the joint popover, the tables, the takeoff). */
export function draftActions(form: DraftForm) {
  return {
    setSupport(joint: string, support: Support | null) {
      const rest = (form.getValues('supports') ?? []).filter((s) => s.joint !== joint);
      form.setValue('supports', support ? [...rest, support] : rest, DIRTY);
    },
    addLoad(load: DraftLoad) {
      form.setValue('loads', [...(form.getValues('loads') ?? []), load], DIRTY);
    },
    removeLoads(indexes: ReadonlySet<number>) {
      form.setValue(
        'loads',
        (form.getValues('loads') ?? []).filter((_, i) => !indexes.has(i)),
        DIRTY,
      );
    },
    /** Adds a load case of a category and returns its id. */
    addCase(category: LoadCategory, name?: string): string {
      const cases = form.getValues('loadCases') ?? [];
      const id = loadCaseIdNext(category, cases);
      form.setValue('loadCases', [...cases, { id, name: name ?? `${CATEGORY_LABELS[category]} ${id}`, category }], DIRTY);
      return id;
    },
    /** Removes a case with its joint loads and its factors in every combination. */
    removeCase(id: string) {
      form.setValue('loadCases', (form.getValues('loadCases') ?? []).filter((c) => c.id !== id), DIRTY);
      form.setValue('loads', (form.getValues('loads') ?? []).filter((l) => l.caseId !== id), DIRTY);
      form.setValue(
        'combinations',
        (form.getValues('combinations') ?? []).map((c) => {
          const factors = { ...c.factors };
          delete factors[id];
          return { ...c, factors };
        }),
        DIRTY,
      );
    },
    /** Replaces the joint loads of the given cases (what the roof loading writes). */
    replaceCaseLoads(caseLoads: Record<string, { joint: string; fx: number; fy: number }[]>) {
      const kept = (form.getValues('loads') ?? []).filter((l) => !(l.caseId in caseLoads));
      const written = Object.entries(caseLoads).flatMap(([caseId, loads]) => loads.map((l) => ({ caseId, joint: l.joint, fx: l.fx, fy: l.fy })));
      form.setValue('loads', [...kept, ...written], DIRTY);
    },
  };
}

import type { ModelDraftInput } from './model-draft';

/**
 * Unsaved model edits kept while the engineer looks at another tab of the truss page (the tab
 * unmounts its form). Memory only: a reload asks first (beforeunload) and then starts clean.
 */
interface KeptDraft {
  /** The saved model version the edits were made on. */
  version: number;
  values: ModelDraftInput;
  /** The roof-takeoff form as it was left (not yet used). */
  takeoffValues: unknown;
}

const kept = new Map<number, KeptDraft>();

export function draftKeep(trussId: number, version: number, values: ModelDraftInput, takeoffValues: unknown): void {
  kept.set(trussId, { version, values, takeoffValues });
}

export function draftTake(trussId: number): KeptDraft | undefined {
  return kept.get(trussId);
}

export function draftForget(trussId: number): void {
  kept.delete(trussId);
}

/** True while a truss has unsaved edits kept aside (the runs tab says the run uses the saved model). */
export function draftIsKept(trussId: number): boolean {
  return kept.has(trussId);
}

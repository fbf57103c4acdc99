/**
 * Which worked steps of a calc sheet changed between two revisions. A step is matched by its
 * anchor id (the solver's step id, e.g. "case-D/joint-C"), or else by its load case and title
 * ("Joint C" of case D) when the ids moved; it is unchanged when its typeset equations and
 * note are the same text. Pure.
 */

export interface ComparedStep {
  id: string;
  /** The number the sheet prints ("6.4"); absent for a step the sheet leaves unnumbered. */
  number?: string;
  title: string;
  /** The load case the step belongs to ('' for model-level steps). */
  caseId: string;
  /** What the step shows: its KaTeX source lines and note, compared as text. */
  content: string;
}

export interface StepChange {
  id: string;
  number: string | null;
  title: string;
  caseId: string;
  /** 'changed': the same step shows other equations; 'added': no such step before. */
  change: 'changed' | 'added';
}

export interface StepsDiff {
  /** Steps of the later sheet that changed or are new, in the later sheet's order. */
  changed: StepChange[];
  /** Steps of the earlier sheet with no counterpart now, numbered as the earlier sheet printed them. */
  removed: { id: string; number: string | null; title: string; caseId: string }[];
  /** Ids of the later sheet's steps that are the same as before, in order. */
  unchanged: string[];
}

export function stepsDiff(before: ComparedStep[], after: ComparedStep[]): StepsDiff {
  const byId = new Map(before.map((s) => [s.id, s]));
  const byTitle = new Map(before.map((s) => [`${s.caseId}\u0000${s.title}`, s]));
  const matched = new Set<string>();
  const changed: StepChange[] = [];
  const unchanged: string[] = [];
  for (const s of after) {
    const earlier = byId.get(s.id) ?? (!byId.has(s.id) ? byTitle.get(`${s.caseId}\u0000${s.title}`) : undefined);
    if (earlier && !matched.has(earlier.id)) {
      matched.add(earlier.id);
      if (earlier.content === s.content) unchanged.push(s.id);
      else changed.push({ id: s.id, number: s.number ?? null, title: s.title, caseId: s.caseId, change: 'changed' });
    } else {
      changed.push({ id: s.id, number: s.number ?? null, title: s.title, caseId: s.caseId, change: 'added' });
    }
  }
  const removed = before.filter((s) => !matched.has(s.id)).map((s) => ({ id: s.id, number: s.number ?? null, title: s.title, caseId: s.caseId }));
  return { changed, removed, unchanged };
}

import type { DiffLine, RevisionDiff, RevisionDiffTolerances } from '../compare/revision-diff';
import type { StepsDiff } from '../compare/step-diff';
import type { UnitSystemId } from '../units';

/** One side of GET /api/sheets/:id/compare: a revision and the run its sheet was made from. */
export interface ComparedRevisionRef {
  id: number;
  label: string;
  status: string;
  runId: number;
  /** "Run 2 of T7". */
  run: string;
  /** yyyy-mm-dd: issued, else submitted for check, else started. */
  date: string;
}

/** GET /api/sheets/:id/compare[?with=<revision id>]: what changed from `against` to `revision`. */
export interface RevisionCompareView {
  revision: ComparedRevisionRef;
  against: ComparedRevisionRef;
  tolerances: RevisionDiffTolerances;
  /** The tolerances in one sentence. */
  toleranceNote: string;
  diff: RevisionDiff;
  /** The project's units: the lines are written in them and the app shows the tables in them (the diff itself is in kN and m). */
  unitSystem: UnitSystemId;
  /** One line per kind of change (the sheet's revision table says the same). */
  lines: DiffLine[];
  /** The worked steps of `revision`'s sheet against `against`'s, by the numbers `revision`'s sheet prints. */
  steps: StepsDiff & { total: number };
}

/** A line of the revision table printed on the sheet's cover. */
export interface RevisionHistoryRow {
  revision: string;
  date: string;
  status: string;
  /** One line per kind that changed against the revision before; a first revision says so. */
  lines: string[];
}

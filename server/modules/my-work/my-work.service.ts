import type { Role } from '@shared/schemas/auth.schema';
import type { DxfImportResult } from '@shared/dxf-import/types';
import { sheetRevisionLabel, type MyWorkView, type WorkDrawingItem, type WorkRevisionItem } from '@shared/schemas/review.schema';
import { User } from '../../db/models';
import { sqlDateIso } from '../../db/sql-dates';
import { recordsRepository, type RevisionRow, type TrussContext } from '../records/records.repository';
import { myWorkRepository as repo, type DrawingProblemRow } from './my-work.repository';

/** At most this many problem sentences are quoted per drawing (problemCount has them all). */
export const DRAWING_PROBLEMS_QUOTED = 5;

export interface WorkPerson {
  id: number;
  role: Role;
}

/**
 * What waits for the signed-in person, by role: a reviewer's revisions to check; an engineer's
 * returned revisions not yet revised and checked revisions to issue; a drafter's drawings whose
 * newest version failed to import or has warnings. Each list is oldest first.
 */
export async function myWork(person: WorkPerson): Promise<MyWorkView> {
  const [toCheckRows, returnedRows, checkedRows, drawings] = await Promise.all([
    person.role === 'reviewer' ? repo.toCheck(person.id) : [],
    person.role === 'engineer' ? repo.preparedBy(person.id, 'returned') : [],
    person.role === 'engineer' ? repo.preparedBy(person.id, 'checked') : [],
    person.role === 'drafter' ? repo.drawingsWithProblems() : [],
  ]);

  // A returned revision drops out once a later revision of its truss exists (it is replaced).
  const siblings = await repo.revisionsOf([...new Set(returnedRows.map((r) => r.trussId))]);
  const returned = returnedRows.filter((r) => !siblings.some((s) => s.trussId === r.trussId && s.number > r.number));

  const revisions = [...toCheckRows, ...returned, ...checkedRows];
  const trussIds = [...new Set([...revisions.map((r) => r.trussId), ...drawings.map((d) => d.trussId)])];
  const [contexts, open, names] = await Promise.all([
    recordsRepository.trussContexts(trussIds),
    repo.openThreadCounts(revisions.map((r) => r.id)),
    userNames(revisions.flatMap((r) => [r.preparedById, r.checkerId])),
  ]);

  const item = (r: RevisionRow, since: Date | null): WorkRevisionItem[] => {
    const c = contexts.get(r.trussId);
    if (!c) return [];
    return [
      {
        id: r.id,
        label: sheetRevisionLabel(r.number),
        status: r.status,
        project: projectOf(c),
        truss: { id: c.trussId, name: c.trussName },
        preparedBy: { id: r.preparedById, name: r.preparedByName ?? names.get(r.preparedById) ?? '(unknown)' },
        checker: r.checkerId === null ? null : { id: r.checkerId, name: names.get(r.checkerId) ?? '(unknown)' },
        since: (since ?? r.updatedAt).toISOString(),
        openCommentCount: open.get(r.id) ?? 0,
      },
    ];
  };

  const view: Omit<MyWorkView, 'total'> = {
    toCheck: toCheckRows.flatMap((r) => item(r, r.submittedAt)),
    returnedToMe: returned.flatMap((r) => item(r, r.updatedAt)),
    readyToIssue: checkedRows.flatMap((r) => item(r, r.checkedAt)),
    drawingsToFix: drawings.flatMap((d) => drawingItem(d, contexts.get(d.trussId))),
  };
  return { ...view, total: view.toCheck.length + view.returnedToMe.length + view.readyToIssue.length + view.drawingsToFix.length };
}

const projectOf = (c: TrussContext) => ({ id: c.projectId, name: c.projectName, jobNumber: c.jobNumber });

function drawingItem(d: DrawingProblemRow, c: TrussContext | undefined): WorkDrawingItem[] {
  if (!c) return [];
  let problems: string[];
  if (d.status === 'failed') {
    const error = d.error ? (JSON.parse(d.error) as { message?: string }) : null;
    problems = [error?.message ?? 'The drawing could not be imported.'];
  } else {
    const report = d.result ? (JSON.parse(d.result) as Pick<DxfImportResult, 'report'>).report : [];
    problems = report.filter((e) => e.severity === 'warning').map((e) => e.message);
    // The text match found a warning the parsed report does not hold: nothing to show.
    if (problems.length === 0) return [];
  }
  return [
    {
      drawingId: d.id,
      version: d.version,
      originalName: d.originalName,
      status: d.status,
      project: projectOf(c),
      truss: { id: c.trussId, name: c.trussName },
      problems: problems.slice(0, DRAWING_PROBLEMS_QUOTED),
      problemCount: problems.length,
      importedAt: sqlDateIso(d.importedAt),
    },
  ];
}

async function userNames(ids: (number | null)[]): Promise<Map<number, string>> {
  const wanted = [...new Set(ids.filter((i): i is number => i !== null))];
  if (wanted.length === 0) return new Map();
  const rows = await User.findAll({ attributes: ['id', 'name'], where: { id: wanted }, raw: true });
  return new Map(rows.map((u) => [u.id, u.name]));
}

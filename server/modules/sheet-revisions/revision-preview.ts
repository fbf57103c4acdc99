import { renderCalcSheetPreview } from '../calc-sheets/calc-sheets.service';
import { loadRunSheet } from '../calc-sheets/run-sheet.service';
import { getRevision } from './sheet-revisions.service';
import { revisionHistoryOf } from './revision-compare.service';

/** The preview of a sheet revision: its label and whoever has signed so far. */
export async function revisionSheetHtml(sheetId: number, publicUrl: () => string, now = new Date()): Promise<string> {
  const revision = await getRevision(sheetId, { publicUrl });
  const [base, revisionHistory] = await Promise.all([loadRunSheet(revision.runId), revisionHistoryOf(sheetId)]);
  const signedAt = (event: string) => revision.events.find((e) => e.to === event)?.at.slice(0, 10);
  return renderCalcSheetPreview({
    ...base,
    revision: revision.label,
    revisionHistory,
    preparedBy: { name: revision.preparedBy.name, date: signedAt('in-check') },
    checkedBy: revision.checkedBy ? { name: revision.checkedBy.name, date: signedAt('checked') } : undefined,
    generatedAt: now,
  });
}

import { buildCalcSheetView, type CalcSheetInput } from '../calc-sheets/calc-sheet-view';
import { renderCalcSheetHtml } from '../calc-sheets/calc-sheet-html';
import type { SheetPrinter } from '../calc-sheets/sheet-printer';
import type { SheetBuildPool } from '../calc-sheets/sheet-build-pool';
import type { RunSheetInput } from '../calc-sheets/run-sheet.service';
import type { SheetRenderer } from './sheet-renderer';
import { revisionHistoryOf } from './revision-compare.service';

/**
 * The issued calc sheet through the calc-sheet module: view builder → Handlebars HTML → the
 * app's Chromium printer. `loadRunSheet` (calc-sheets/run-sheet.service.ts) reads the run's snapshot,
 * analysis, takeoff steps, project and firm.
 */
export function calcSheetRenderer(deps: {
  printer: SheetPrinter;
  loadRunSheet(runId: number): Promise<RunSheetInput>;
  /** Builds the HTML in a worker thread; without it, here. */
  builder?: SheetBuildPool;
  now?: () => Date;
}): SheetRenderer {
  return {
    async renderPdf({ runId, revisionLabel, signatures, issue }) {
      const base = await deps.loadRunSheet(runId);
      // The revision table: the issued copy prints the history up to itself, dated as issued now.
      const revisionHistory = issue ? await revisionHistoryOf(issue.sheetId, signatures ? { issuedAt: signatures.issuedBy.date } : {}) : undefined;
      const input: CalcSheetInput = {
        ...base,
        revision: revisionLabel,
        ...(revisionHistory ? { revisionHistory } : {}),
        preparedBy: signatures ? { name: signatures.preparedBy.name, date: signatures.preparedBy.date.slice(0, 10) } : undefined,
        checkedBy: signatures ? { name: signatures.checkedBy.name, date: signatures.checkedBy.date.slice(0, 10) } : undefined,
        issuedBy: signatures ? { name: signatures.issuedBy.name, date: signatures.issuedBy.date.slice(0, 10) } : undefined,
        generatedAt: signatures?.issuedBy.date ?? (deps.now ?? (() => new Date()))(),
        issue: issue ?? null,
      };
      // The signed record: printed ahead of every waiting preview (see sheet-printer.ts).
      const html = deps.builder ? (await deps.builder.build(input)).html : renderCalcSheetHtml(buildCalcSheetView(input));
      return deps.printer.print(html, base.firm.paperSize, { priority: 'issue', label: `issue-run-${runId}` });
    },
  };
}

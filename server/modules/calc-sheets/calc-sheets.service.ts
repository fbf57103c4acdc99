import { buildCalcSheetView, type CalcSheetInput } from './calc-sheet-view';
import { renderCalcSheetHtml } from './calc-sheet-html';
import type { PrintRequest, SheetPrinter } from './sheet-printer';

/**
 * Use cases of the calc sheet, easy to call from a route: plain inputs in, HTML or PDF bytes out.
 * The HTML of the preview and the PDF are the same document.
 */

/** The calc sheet as one self-contained HTML document (the in-app preview). */
export function renderCalcSheetPreview(input: CalcSheetInput): string {
  return renderCalcSheetHtml(buildCalcSheetView(input));
}

/** The calc sheet as PDF bytes, on the firm's paper size, through the given (shared) printer. */
export async function renderCalcSheetPdf(input: CalcSheetInput, printer: SheetPrinter, request: PrintRequest = {}): Promise<Buffer> {
  const view = buildCalcSheetView(input);
  return printer.print(renderCalcSheetHtml(view), view.paper, request);
}

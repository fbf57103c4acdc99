import { buildCalcSheetView, type CalcSheetInput } from './calc-sheet-view';
import { renderCalcSheetHtml } from './calc-sheet-html';
import { createSheetPrinter, type SheetPrinter } from './sheet-printer';

/**
 * Use cases of the calc sheet, easy to call from a route: plain inputs in, HTML or PDF bytes out.
 * The HTML of the preview and the PDF are the same document.
 */

/** The calc sheet as one self-contained HTML document (the in-app preview). */
export function renderCalcSheetPreview(input: CalcSheetInput): string {
  return renderCalcSheetHtml(buildCalcSheetView(input));
}

/** The calc sheet as PDF bytes, on the firm's paper size, through the given (shared) printer. */
export async function renderCalcSheetPdf(input: CalcSheetInput, printer: SheetPrinter): Promise<Buffer> {
  const view = buildCalcSheetView(input);
  return printer.print(renderCalcSheetHtml(view), view.paper);
}

let shared: SheetPrinter | null = null;

/**
 * The server's one printer (one Chromium for the whole process), made on first use. The browser
 * itself starts on the first print.
 */
export function sharedSheetPrinter(options: { chromiumPath: string; timeoutMs?: number }): SheetPrinter {
  if (!shared) shared = createSheetPrinter(options);
  return shared;
}

/** Closes the shared printer's browser; call on server shutdown. */
export async function sharedSheetPrinterClose(): Promise<void> {
  const p = shared;
  shared = null;
  if (p) await p.close();
}

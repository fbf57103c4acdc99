/**
 * The calc sheet's view model: everything the Handlebars templates print, already formatted
 * (numbers with units and fixed decimals per unit, tension + with (T), compression − with (C))
 * and with every equation typeset to HTML by KaTeX. Pure: no I/O, no clock (the caller passes
 * `generatedAt`). Built section by section in view/ (one file per section, listed in
 * view/index.ts); this file is the module's entry.
 */
export { buildCalcSheetView } from './view/index';
export { equationHtml, katexHtml } from './view/format';
export { RESIDUAL_RELATIVE_LIMIT } from './view/context';
export type { CalcSheetInput, CalcSheetView, CaseView, SheetSigner, StepView, TableRow } from './view/types';

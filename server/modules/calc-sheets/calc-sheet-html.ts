import fs from 'node:fs';
import path from 'node:path';
import Handlebars from 'handlebars';
import type { CalcSheetView } from './calc-sheet-view';
import { notoCssFor, sheetAssets, TEMPLATES_DIR } from './sheet-assets';
import { forceLegendSvg } from '@shared/drawing/truss-svg';

/**
 * Turns a calc sheet view into one self-contained HTML document (fonts and styles inlined). The
 * same document is the in-app preview and what Chromium prints to PDF.
 */

/** Escapes a string for a CSS string literal in double quotes (title block in the page margins). */
export function cssString(value: unknown): string {
  return String(value ?? '')
    .replace(/\\/g, '\\\\')
    .replace(/"/g, '\\"')
    .replace(/[\r\n]+/g, ' ')
    .replace(/</g, '\\3C ');
}

type Render = (context: unknown) => string;
/** Per process and harmless: the compiled templates of the package. */
let compiled: Render | null = null;

function compile(): Render {
  const hb = Handlebars.create();
  hb.registerHelper('eq', (a: unknown, b: unknown) => a === b);
  hb.registerHelper('gt', (a: number, b: number) => a > b);
  hb.registerHelper('cssString', (v: unknown) => new hb.SafeString(cssString(v)));
  const dir = path.join(TEMPLATES_DIR, 'partials');
  for (const file of fs.readdirSync(dir)) {
    if (!file.endsWith('.hbs')) continue;
    hb.registerPartial(file.slice(0, -4), fs.readFileSync(path.join(dir, file), 'utf8'));
  }
  const main = fs.readFileSync(path.join(TEMPLATES_DIR, 'calc-sheet.hbs'), 'utf8');
  return hb.compile(main, { strict: false, noEscape: false });
}

const SUPERSCRIPT_PLAIN: Readonly<Record<string, string>> = {
  '⁰': '0', '¹': '1', '²': '2', '³': '3', '⁴': '4', '⁵': '5', '⁶': '6', '⁷': '7', '⁸': '8', '⁹': '9', '⁻': '\u2212',
};

/**
 * The view writes powers of ten as the app does, "2.0 × 10⁻¹⁴" (scientificFormat). Inter's subsets
 * the sheet embeds hold ¹ ² ³ but not ⁰ ⁴–⁹ ⁻ (U+2070–207F), which would print in a system face;
 * on the sheet the exponent is set as <sup> in Inter's own figures and minus instead.
 */
export function sheetPowersOfTen(html: string): string {
  return html.replace(/ × 10([⁻⁰¹²³⁴⁵⁶⁷⁸⁹]+)/g, (_, e: string) => ` × 10<sup class="pow">${[...e].map((ch) => SUPERSCRIPT_PLAIN[ch]).join('')}</sup>`);
}

/** The full HTML document of a calc sheet. */
export function renderCalcSheetHtml(view: CalcSheetView): string {
  if (!compiled) compiled = compile();
  // Noto faces only for the scripts the sheet's text uses (a tag in Arabic, a note in Hebrew).
  return sheetPowersOfTen(compiled({ ...view, assets: sheetAssets(), notoCss: notoCssFor(JSON.stringify(view)), legendSvg: forceLegendSvg() }));
}

/** Forgets the compiled templates (after editing them in development). */
export function calcSheetTemplatesReset(): void {
  compiled = null;
}

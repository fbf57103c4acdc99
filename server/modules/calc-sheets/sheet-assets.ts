import fs from 'node:fs';
import path from 'node:path';
import { fileURLToPath } from 'node:url';

/**
 * The calc sheet's fonts and style sheets, read once from the installed packages and inlined so
 * the HTML is self-contained: the same document serves the in-app preview and the PDF, needs no
 * network and no static route, and every font ends up embedded in the PDF.
 */

const ROOT = path.resolve(path.dirname(fileURLToPath(import.meta.url)), '..', '..', '..');
const require_ = (rel: string) => path.join(ROOT, 'node_modules', rel);

/** Where the Handlebars templates and the sheet's own CSS live. */
export const TEMPLATES_DIR = path.join(ROOT, 'templates');

function dataUri(file: string, mime: string): string {
  return `data:${mime};base64,${fs.readFileSync(file).toString('base64')}`;
}

/** The Inter faces the sheet uses: weights × the subsets its text needs. */
const INTER_WEIGHTS = [400, 500, 600, 700] as const;
const INTER_SUBSETS = ['latin', 'latin-ext', 'greek'] as const;

function interCss(): string {
  const dir = require_('@fontsource/inter');
  const ranges = JSON.parse(fs.readFileSync(path.join(dir, 'unicode.json'), 'utf8')) as Record<string, string>;
  const faces: string[] = [];
  for (const subset of INTER_SUBSETS) {
    const range = ranges[subset];
    if (!range) throw new Error(`@fontsource/inter has no unicode range for the "${subset}" subset; reinstall the package.`);
    for (const weight of INTER_WEIGHTS) {
      const file = path.join(dir, 'files', `inter-${subset}-${weight}-normal.woff2`);
      faces.push(
        `@font-face{font-family:'Inter';font-style:normal;font-weight:${weight};font-display:block;` +
          `src:url(${dataUri(file, 'font/woff2')}) format('woff2');unicode-range:${range}}`,
      );
    }
  }
  return faces.join('\n');
}

/**
 * KaTeX's CSS with every @font-face source replaced by its woff2 file as a data: URI.
 * WARNING: the replacement must cover every face; a face left with a relative url() loads
 * nothing and Chromium silently falls back to a system serif. `katexCss` throws instead.
 */
function katexCss(): string {
  const dist = require_('katex/dist');
  const css = fs.readFileSync(path.join(dist, 'katex.min.css'), 'utf8');
  let faces = 0;
  const out = css.replace(/@font-face\{([^}]*)\}/g, (_whole, body: string) => {
    const woff2 = /url\((?:["']?)(fonts\/[^)"']+\.woff2)(?:["']?)\)/.exec(body);
    if (!woff2) throw new Error('A KaTeX @font-face has no woff2 source; the katex package layout has changed.');
    faces += 1;
    const src = `src:url(${dataUri(path.join(dist, woff2[1]), 'font/woff2')}) format("woff2")`;
    return `@font-face{${body.replace(/src:[^;}]*/, src)}}`;
  });
  if (faces === 0 || /url\((?!data:)/.test(out)) {
    throw new Error('KaTeX CSS still refers to font files after inlining; the katex package layout has changed.');
  }
  return out;
}

export interface SheetAssets {
  /** @font-face rules for Inter (data: URIs). */
  interCss: string;
  /** KaTeX CSS with its fonts as data: URIs. */
  katexCss: string;
  /** The sheet's own CSS (templates/sheet.css). */
  sheetCss: string;
}

let cached: SheetAssets | null = null;

/** Reads (once) and returns the inlined fonts and style sheets. */
export function sheetAssets(): SheetAssets {
  if (!cached) {
    cached = {
      interCss: interCss(),
      katexCss: katexCss(),
      sheetCss: fs.readFileSync(path.join(TEMPLATES_DIR, 'sheet.css'), 'utf8'),
    };
  }
  return cached;
}

/** Forgets the cached assets (tests and template editing). */
export function sheetAssetsReset(): void {
  cached = null;
}

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
 * Noto faces for scripts Inter lacks (Arabic, Hebrew, Devanagari, Cyrillic, extended Greek,
 * Vietnamese), from the @fontsource packages, as data: URIs. They follow Inter (and KaTeX's own
 * fonts) in every font stack, so a tag read from a drawing in any of these scripts prints with its
 * glyphs rather than empty boxes. Each face keeps its unicode-range; `notoCssFor` inlines only the
 * faces a sheet's text needs, so a Latin-only sheet carries none of them.
 */
export const NOTO_STACK = "'Noto Sans', 'Noto Sans Arabic', 'Noto Sans Hebrew', 'Noto Sans Devanagari'";
const NOTO_FACES: { pkg: string; family: string; subsets: string[] }[] = [
  { pkg: 'noto-sans', family: 'Noto Sans', subsets: ['cyrillic', 'cyrillic-ext', 'greek-ext', 'vietnamese'] },
  { pkg: 'noto-sans-arabic', family: 'Noto Sans Arabic', subsets: ['arabic'] },
  { pkg: 'noto-sans-hebrew', family: 'Noto Sans Hebrew', subsets: ['hebrew'] },
  { pkg: 'noto-sans-devanagari', family: 'Noto Sans Devanagari', subsets: ['devanagari'] },
];
const NOTO_WEIGHTS = [400, 700] as const;

interface FontFace {
  css: string;
  /** Inclusive code point ranges of the face's unicode-range. */
  ranges: [number, number][];
}

function parseUnicodeRange(range: string): [number, number][] {
  return range.split(',').map((part) => {
    const m = /U\+([0-9A-F?]+)(?:-([0-9A-F]+))?/i.exec(part.trim());
    if (!m) throw new Error(`Cannot read the unicode-range "${part}" of a Noto face; reinstall the @fontsource packages.`);
    if (m[1].includes('?')) return [parseInt(m[1].replace(/\?/g, '0'), 16), parseInt(m[1].replace(/\?/g, 'F'), 16)];
    const lo = parseInt(m[1], 16);
    return [lo, m[2] ? parseInt(m[2], 16) : lo];
  });
}

function notoFaces(): FontFace[] {
  const faces: FontFace[] = [];
  for (const { pkg, family, subsets } of NOTO_FACES) {
    const dir = require_(`@fontsource/${pkg}`);
    const ranges = JSON.parse(fs.readFileSync(path.join(dir, 'unicode.json'), 'utf8')) as Record<string, string>;
    for (const subset of subsets) {
      const range = ranges[subset];
      if (!range) throw new Error(`@fontsource/${pkg} has no unicode range for the "${subset}" subset; reinstall the package.`);
      for (const weight of NOTO_WEIGHTS) {
        const file = path.join(dir, 'files', `${pkg}-${subset}-${weight}-normal.woff2`);
        faces.push({
          css:
            `@font-face{font-family:'${family}';font-style:normal;font-weight:${weight};font-display:block;` +
            `src:url(${dataUri(file, 'font/woff2')}) format('woff2');unicode-range:${range}}`,
          ranges: parseUnicodeRange(range),
        });
      }
    }
  }
  return faces;
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
  // Text KaTeX's fonts lack (a tag in Arabic inside \text{}) falls back to the shipped Noto faces,
  // never to a system font.
  let stacks = 0;
  const withNoto = out
    // (not inside an @font-face, where font-family names the face and takes one name only)
    .replace(/(@font-face\{[^}]*\})|font-family:(KaTeX_[A-Za-z0-9]+|"KaTeX_[A-Za-z0-9]+")(?=[;}])/g, (whole, face: string | undefined, fam: string) => {
      if (face) return whole;
      stacks += 1;
      return `font-family:${fam},${NOTO_STACK}`;
    })
    .replace(/font:normal 1\.21em KaTeX_Main,Times New Roman,serif/, () => {
      stacks += 1;
      return `font:normal 1.21em KaTeX_Main,${NOTO_STACK},serif`;
    });
  if (stacks < 10) throw new Error('KaTeX CSS font stacks were not found; the katex package layout has changed.');
  return withNoto;
}

export interface SheetAssets {
  /** @font-face rules for Inter (data: URIs). */
  interCss: string;
  /** KaTeX CSS with its fonts as data: URIs. */
  katexCss: string;
  /** The sheet's own CSS (templates/sheet.css). */
  sheetCss: string;
  /** Every Noto face with its code point ranges (see `notoCssFor`). */
  notoFaces: FontFace[];
}

let cached: SheetAssets | null = null;

/** Reads (once) and returns the inlined fonts and style sheets. */
export function sheetAssets(): SheetAssets {
  if (!cached) {
    cached = {
      interCss: interCss(),
      katexCss: katexCss(),
      sheetCss: fs.readFileSync(path.join(TEMPLATES_DIR, 'sheet.css'), 'utf8'),
      notoFaces: notoFaces(),
    };
  }
  return cached;
}

/** Forgets the cached assets (tests and template editing). */
export function sheetAssetsReset(): void {
  cached = null;
}

/** Matches any character outside Basic Latin, Latin-1 and Latin Extended-A/B (which Inter covers). */
const BEYOND_LATIN = /[^\u0000-\u024F]/gu;

/**
 * The @font-face rules of the Noto faces whose unicode-range holds a character of `text`: the
 * faces a sheet needs, and only those (empty for a sheet in Latin script alone).
 */
export function notoCssFor(text: string): string {
  const codes = new Set<number>();
  for (const m of text.matchAll(BEYOND_LATIN)) codes.add(m[0].codePointAt(0)!);
  if (codes.size === 0) return '';
  const wanted = sheetAssets().notoFaces.filter((face) => [...codes].some((c) => face.ranges.some(([lo, hi]) => c >= lo && c <= hi)));
  return wanted.map((f) => f.css).join('\n');
}

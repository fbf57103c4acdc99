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

/** Unicode blocks (The Unicode Standard, Blocks.txt), inclusive code point ranges. */
const HAN_AND_KANA: [number, number][] = [
  [0x2e80, 0x2fff], // CJK Radicals Supplement, Kangxi Radicals, Ideographic Description Characters
  [0x3000, 0x312f], // CJK Symbols and Punctuation, Hiragana, Katakana, Bopomofo
  [0x3190, 0x33ff], // Kanbun … CJK Compatibility (Bopomofo Extended, CJK Strokes, Katakana Phonetic Extensions, Enclosed CJK)
  [0x3400, 0x4dbf], // CJK Unified Ideographs Extension A
  [0x4e00, 0x9fff], // CJK Unified Ideographs
  [0xf900, 0xfaff], // CJK Compatibility Ideographs
  [0xfe10, 0xfe1f], // Vertical Forms
  [0xfe30, 0xfe4f], // CJK Compatibility Forms
  [0xff00, 0xffef], // Halfwidth and Fullwidth Forms
  [0x1f200, 0x1f2ff], // Enclosed Ideographic Supplement (🈀 U+1F200, a squared hiragana, is in the Japanese package)
  [0x20000, 0x3ffff], // Supplementary and Tertiary Ideographic Planes
];
const HANGUL: [number, number][] = [
  [0x1100, 0x11ff], // Hangul Jamo
  [0x3130, 0x318f], // Hangul Compatibility Jamo
  [0xa960, 0xa97f], // Hangul Jamo Extended-A
  [0xac00, 0xd7ff], // Hangul Syllables, Hangul Jamo Extended-B
];
const THAI: [number, number][] = [[0x0e00, 0x0e7f]];

/**
 * Chinese, Japanese, Korean and Thai: @fontsource/noto-sans-sc, -jp, -tc, -kr and -thai. The CJK
 * packages split their font into about a hundred numbered subsets by unicode-range; each subset is
 * its own face here, so a sheet carries only the subsets its characters fall in. Each face's range
 * is cut down to its script's blocks (`blocks`): the numbered subsets also hold Latin letters and
 * punctuation, which Inter prints, and a Latin-only sheet must not pull any of them in.
 *
 * These faces join the 'Noto Sans' family (one family may be made of faces with different
 * unicode-ranges, CSS Fonts Level 4 §4.5), so every font stack that names 'Noto Sans' (the sheet's
 * CSS, KaTeX's stacks, the drawings' SVG) reaches them without being edited. Where two faces of
 * the family cover one character the face declared last is tried first (§4.5). The list runs
 * Korean, Traditional Chinese, Japanese, Simplified Chinese, so a Han character or kana prints in
 * the Simplified Chinese face when that has it (as before the Japanese and Traditional Chinese
 * packages joined), else in the Japanese face (the seven rare kana ゔゕゖヷヸヹヺ and some 500 Han
 * characters), else the Traditional Chinese one, else the Korean one. Each package's numbered
 * subsets hold only the characters its language uses most, so together they still leave out
 * 3 914 of the 20 992 code points of CJK Unified Ideographs U+4E00–9FFF (tests/sheet-fonts.test.ts).
 */
const CJK_FACES: { pkg: string; family: string; subsets: RegExp; blocks: [number, number][] }[] = [
  { pkg: 'noto-sans-kr', family: 'Noto Sans', subsets: /^\[(\d+)\]$/, blocks: [...HANGUL, ...HAN_AND_KANA] },
  { pkg: 'noto-sans-tc', family: 'Noto Sans', subsets: /^\[(\d+)\]$/, blocks: HAN_AND_KANA },
  { pkg: 'noto-sans-jp', family: 'Noto Sans', subsets: /^\[(\d+)\]$/, blocks: HAN_AND_KANA },
  { pkg: 'noto-sans-sc', family: 'Noto Sans', subsets: /^\[(\d+)\]$/, blocks: HAN_AND_KANA },
  { pkg: 'noto-sans-thai', family: 'Noto Sans', subsets: /^(thai)$/, blocks: THAI },
];

/**
 * The CJK packages' unicode-ranges name code points their font files have no glyph for: the
 * Simplified Chinese one 994 (compatibility ideographs such as U+F9E1, U+9FF0–9FFF, …), the
 * Traditional Chinese one 3 145, the Korean one 100, the Japanese one none. A face chosen for
 * such a character would print an empty box while another package has the glyph, so each face's
 * range leaves them out. The list is read from the font files' character maps by fc-query
 * (scripts/cjk-range-gaps.mjs writes cjk-range-gaps.json; tests/sheet-fonts.test.ts checks it
 * against the installed files).
 */
function cjkRangeGaps(): Map<string, Set<number>> {
  const file = path.join(path.dirname(fileURLToPath(import.meta.url)), 'cjk-range-gaps.json');
  const data = JSON.parse(fs.readFileSync(file, 'utf8')) as Record<string, { version: string; gaps: string }>;
  const out = new Map<string, Set<number>>();
  for (const [pkg, { gaps }] of Object.entries(data)) {
    const set = new Set<number>();
    if (gaps) for (const [lo, hi] of parseUnicodeRange(gaps)) for (let c = lo; c <= hi; c++) set.add(c);
    out.set(pkg, set);
  }
  return out;
}

export interface FontFace {
  family: string;
  weight: number;
  /** The woff2 file, read when the face is first inlined. */
  file: string;
  /** The face's unicode-range as written in its @font-face rule. */
  range: string;
  /** Inclusive code point ranges of `range`. */
  ranges: [number, number][];
  /**
   * The faces joined to 'Noto Sans' from the CJK and Thai packages: their place in `CJK_FACES`.
   * Of two such faces that cover one character only the later one's is needed (it is tried first).
   */
  joinedRank?: number;
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

/** The parts of `ranges` inside `blocks`. */
function rangesWithin(ranges: [number, number][], blocks: [number, number][]): [number, number][] {
  const out: [number, number][] = [];
  for (const [lo, hi] of ranges) {
    for (const [blo, bhi] of blocks) {
      const a = Math.max(lo, blo);
      const b = Math.min(hi, bhi);
      if (a <= b) out.push([a, b]);
    }
  }
  return out.sort((x, y) => x[0] - y[0]);
}

/** `ranges` with the code points `keep` refuses taken out (all of them kept without `keep`). */
function rangesKept(ranges: [number, number][], keep?: (c: number) => boolean): [number, number][] {
  if (!keep) return ranges;
  const out: [number, number][] = [];
  for (const [lo, hi] of ranges) {
    for (let c = lo; c <= hi; c++) {
      if (!keep(c)) continue;
      const last = out[out.length - 1];
      if (last && last[1] === c - 1) last[1] = c;
      else out.push([c, c]);
    }
  }
  return out;
}

function unicodeRangeText(ranges: [number, number][]): string {
  const hex = (n: number) => n.toString(16).toUpperCase();
  return ranges.map(([lo, hi]) => (lo === hi ? `U+${hex(lo)}` : `U+${hex(lo)}-${hex(hi)}`)).join(',');
}

function fontsourceRanges(pkg: string): { dir: string; ranges: Record<string, string> } {
  const dir = require_(`@fontsource/${pkg}`);
  return { dir, ranges: JSON.parse(fs.readFileSync(path.join(dir, 'unicode.json'), 'utf8')) as Record<string, string> };
}

function notoFaces(): FontFace[] {
  const faces: FontFace[] = [];
  for (const { pkg, family, subsets } of NOTO_FACES) {
    const { dir, ranges } = fontsourceRanges(pkg);
    for (const subset of subsets) {
      const range = ranges[subset];
      if (!range) throw new Error(`@fontsource/${pkg} has no unicode range for the "${subset}" subset; reinstall the package.`);
      for (const weight of NOTO_WEIGHTS) {
        faces.push({ family, weight, file: path.join(dir, 'files', `${pkg}-${subset}-${weight}-normal.woff2`), range, ranges: parseUnicodeRange(range) });
      }
    }
  }
  const gaps = cjkRangeGaps();
  for (const [rank, { pkg, family, subsets, blocks }] of CJK_FACES.entries()) {
    const { dir, ranges } = fontsourceRanges(pkg);
    const lacking = gaps.get(pkg);
    const keep = lacking?.size ? (c: number) => !lacking.has(c) : undefined;
    let found = 0;
    for (const [key, range] of Object.entries(ranges)) {
      const m = subsets.exec(key);
      if (!m) continue;
      const within = rangesKept(rangesWithin(parseUnicodeRange(range), blocks), keep);
      if (within.length === 0) continue;
      found += 1;
      for (const weight of NOTO_WEIGHTS) {
        faces.push({
          family,
          weight,
          file: path.join(dir, 'files', `${pkg}-${m[1]}-${weight}-normal.woff2`),
          range: unicodeRangeText(within),
          ranges: within,
          joinedRank: rank,
        });
      }
    }
    if (found === 0) throw new Error(`@fontsource/${pkg} has no subset in its script's blocks; reinstall the package.`);
  }
  return faces;
}

/** The face's @font-face rule with its font file as a data: URI (read when asked for: the CJK faces are some 11 MB together). */
function faceCss(face: FontFace): string {
  return (
    `@font-face{font-family:'${face.family}';font-style:normal;font-weight:${face.weight};font-display:block;` +
    `src:url(${dataUri(face.file, 'font/woff2')}) format('woff2');unicode-range:${face.range}}`
  );
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

/** Per process and harmless: files read from the package, the same in every process. */
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

/** Matches any character outside Basic Latin, Latin-1 and Latin Extended-A/B (which Inter covers; code points from U+0250 on). */
const BEYOND_LATIN = /[^\u0000-\u024F]/gu;

/** Code point → the faces whose range holds it, built once per set of faces. */
const faceIndexes = new WeakMap<FontFace[], Map<number, FontFace[]>>();

function faceIndex(faces: FontFace[]): Map<number, FontFace[]> {
  let index = faceIndexes.get(faces);
  if (!index) {
    index = new Map();
    for (const face of faces) {
      for (const [lo, hi] of face.ranges) {
        // The installed faces' widest range spans under a thousand code points; a far wider one is a changed package.
        if (hi - lo > 0x10000) throw new Error(`A Noto face's unicode-range U+${lo.toString(16)}-${hi.toString(16)} is wider than expected; check the @fontsource packages.`);
        for (let c = Math.max(lo, 0x250); c <= hi; c++) {
          const list = index.get(c);
          if (list) list.push(face);
          else index.set(c, [face]);
        }
      }
    }
    faceIndexes.set(faces, index);
  }
  return index;
}

/**
 * The @font-face rules of the Noto faces whose unicode-range holds a character of `text`: the
 * faces a sheet needs, and only those (empty for a sheet in Latin script alone), in the order the
 * faces are listed (which decides the Korean/Chinese overlap, see `CJK_FACES`).
 */
export function notoCssFor(text: string): string {
  return notoFacesFor(text).map(faceCss).join('\n');
}

/** The Noto faces `notoCssFor` inlines for `text`. */
export function notoFacesFor(text: string): FontFace[] {
  const faces = sheetAssets().notoFaces;
  const index = faceIndex(faces);
  const wanted = new Set<FontFace>();
  for (const m of text.matchAll(BEYOND_LATIN)) {
    const covering = index.get(m[0].codePointAt(0)!) ?? [];
    // Of the joined faces only the package tried first for this character (the highest rank).
    const top = Math.max(-1, ...covering.map((f) => f.joinedRank ?? -1));
    for (const face of covering) if (face.joinedRank === undefined || face.joinedRank === top) wanted.add(face);
  }
  return faces.filter((f) => wanted.has(f));
}

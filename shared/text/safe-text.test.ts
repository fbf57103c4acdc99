import katex from 'katex';
import seedrandom from 'seedrandom';
import { beforeAll, describe, expect, it, vi } from 'vitest';
import { hasUnsafeText, plainText, texText } from './safe-text';

/**
 * Property tests over random strings from a seeded generator (no fast-check in the install): the
 * characters TeX gives a meaning to, bidi controls, control characters, lone surrogates,
 * combining marks and text in Arabic, Hebrew, Devanagari, Cyrillic, Chinese, Japanese kana
 * (with a combining voiced mark), Korean (syllables and conjoining jamo) and Thai (with its
 * vowel and tone marks). The checks lean on
 * sources outside this file: KaTeX itself (renderToString with throwOnError), and the Unicode
 * Character Database as the JS regex engine carries it (\p{Bidi_Control}, \p{Cc}, NFC).
 */

const TEX = ['\\', '~', '^', '{', '}', '%', '#', '&', '_', '$'];
// UAX #9 (Unicode Bidirectional Algorithm), table 4: the explicit formatting characters and marks.
const BIDI = ['\u202A', '\u202B', '\u202C', '\u202D', '\u202E', '\u2066', '\u2067', '\u2068', '\u2069', '\u200E', '\u200F', '\u061C'];
const CONTROL = ['\u0000', '\u0007', '\t', '\n', '\r', '\u001B', '\u007F', '\u0085', '\u009F', '\u2028', '\u2029'];
const SURROGATES = ['\uD800', '\uDBFF', '\uDC00', '\uDFFF'];
const COMBINING = ['\u0301', '\u0308', '\u0327', '\u0336', '\u036F'];
const SCRIPTS = [
  'عقدة', 'ب', '١٢', // Arabic letters and Arabic-Indic digits
  'צומת', 'א', // Hebrew
  'बिंदु', 'क्ष', // Devanagari with a virama conjunct
  'Узел', 'Ж', // Cyrillic
  '节点', '荷重', '﨑', // Han (U+FA11 from the compatibility block)
  'の', 'カタカナ', '\u304B\u3099', 'ｶﾅ', // kana: か with a combining voiced mark (NFC: が), half-width katakana
  '절점', '\u1100\u1161', 'ㄱ', // Hangul: a syllable, conjoining jamo ᄀ+ᅡ (NFC: 가), a compatibility jamo
  'จุดต่อ', 'น้ำ', '\u0E33', // Thai: vowel and tone marks above and below, a lone sara am
  'é', 'ß', 'Ω', '°', '×', '−', '–', '—', '’', '…', '🙂',
];
const PLAIN = ['A', 'b', 'Z', '0', '7', ' ', '-', '--', "'", '`', '"', '.', ',', ':', '/', '(', ')', '[', ']', '<', '>', '|', '!', '?', '@', '+', '=', '*', '\\P', '\\text', '\\\\'];
/** No lone surrogate (String.prototype.isWellFormed, ES2024; the project's lib is older). */
const wellFormed = (s: string) => (s as unknown as { isWellFormed(): boolean }).isWellFormed();

const POOLS = [TEX, BIDI, CONTROL, SURROGATES, COMBINING, SCRIPTS, PLAIN];

function randomString(rng: () => number): string {
  const n = Math.floor(rng() * 24);
  let s = '';
  for (let i = 0; i < n; i++) {
    const pool = POOLS[Math.floor(rng() * POOLS.length)];
    s += pool[Math.floor(rng() * pool.length)];
  }
  return s;
}

const SEEDS = ['tags-1', 'tags-2', 'tags-3'];
const PER_SEED = 700;
/** KaTeX renders some ten thousand formulas here; generous for a busy shared machine. */
const HEAVY = 180_000;

function* cases(): Generator<string> {
  for (const seed of SEEDS) {
    const rng = seedrandom(seed);
    for (let i = 0; i < PER_SEED; i++) yield randomString(rng);
  }
}

/** The characters KaTeX typeset, read back from its HTML (tags dropped, entities decoded). */
function typeset(html: string): string {
  return html
    .replace(/<span class="katex-mathml">[\s\S]*?<\/math><\/span>/g, '')
    .replace(/<[^>]+>/g, '')
    .replace(/&#x([0-9a-f]+);/gi, (_m, h: string) => String.fromCodePoint(parseInt(h, 16)))
    .replace(/&quot;/g, '"')
    .replace(/&#39;/g, "'")
    .replace(/&lt;/g, '<')
    .replace(/&gt;/g, '>')
    .replace(/&amp;/g, '&');
}

describe('texText and plainText over random strings', () => {
  beforeAll(() => {
    // KaTeX warns on the console for every character its fonts have no metrics for (all non-Latin text).
    vi.spyOn(console, 'warn').mockImplementation(() => {});
  });

  it('when any string goes through texText, then KaTeX renders it with throwOnError, in math, display and subscript use', () => {
    let n = 0;
    for (const s of cases()) {
      const src = texText(s);
      for (const [tex, displayMode] of [[src, false], [src, true], [`N_{${src}} = ${src} + 1`, false]] as const) {
        expect(() => katex.renderToString(tex, { throwOnError: true, strict: 'ignore', displayMode, output: 'html' }), JSON.stringify(s)).not.toThrow();
      }
      n++;
    }
    expect(n).toBe(SEEDS.length * PER_SEED);
  }, HEAVY);

  it('when KaTeX typesets texText, then the characters printed are those of plainText (apostrophe and grave as TeX quotes)', () => {
    for (const s of cases()) {
      const html = katex.renderToString(texText(s), { throwOnError: true, strict: 'ignore', output: 'html' });
      // TeX prints ' and ` as closing and opening single quotes (Knuth, The TeXbook, ch. 2).
      const expected = plainText(s).replace(/'/g, '\u2019').replace(/`/g, '\u2018');
      // KaTeX writes a space in text mode as a no-break space.
      const got = typeset(html).replace(/\u00A0/g, ' ');
      // KaTeX builds an accented letter (é) from its base and a spacing accent (e + ˊ), so both
      // sides are compared on base characters: marks and spacing modifier letters dropped, and the
      // zero-width space KaTeX puts between stacked accents.
      const bases = (t: string) => t.normalize('NFD').replace(/[\p{M}\u02B0-\u02FF\u00A8\u00AF\u00B4\u00B8\u200B]/gu, '');
      expect(bases(got), JSON.stringify(s)).toBe(bases(expected));
    }
  }, HEAVY);

  it('when any string goes through plainText, then no bidi control, control character or lone surrogate is left and the result is NFC', () => {
    for (const s of cases()) {
      const out = plainText(s);
      expect(out, JSON.stringify(s)).not.toMatch(/\p{Bidi_Control}/u);
      expect(out).not.toMatch(/[\p{Cc}\u2028\u2029]/u);
      expect(wellFormed(out)).toBe(true);
      expect(out).toBe(out.normalize('NFC'));
      // Idempotent: cleaning clean text changes nothing.
      expect(plainText(out)).toBe(out);
      expect(hasUnsafeText(out)).toBe(false);
    }
  });

  it("when a tag holds a double prime or a run of spaces, then KaTeX prints two quotes and every space (TeX would join '' into one double quote and fold spaces)", () => {
    const out = (t: string) => typeset(katex.renderToString(texText(t), { throwOnError: true, strict: 'ignore', output: 'html' })).replace(/\u00A0/g, ' ');
    expect(out("U1''")).toBe('U1\u2019\u2019');
    expect(out('A  B')).toBe('A  B');
    expect(out('L--R')).toBe('L--R');
  });

  it('when a string holds a bidi control, then hasUnsafeText says so and plainText keeps every other letter in order', () => {
    expect(hasUnsafeText('A\u202EB')).toBe(true);
    expect(plainText('\u2067عقدة\u2069-1\u200F')).toBe('عقدة-1');
    expect(plainText('U\u202E1\u202C')).toBe('U1');
  });

  it('when the generator runs, then it does produce every kind of hostile character (the property tests above are not vacuous)', () => {
    const seen = new Set<string>();
    for (const s of cases()) {
      if (/\p{Bidi_Control}/u.test(s)) seen.add('bidi');
      if (/[\\~^{}%#&_$]/.test(s)) seen.add('tex');
      if (!wellFormed(s)) seen.add('surrogate');
      if (/\p{Script=Arabic}/u.test(s)) seen.add('arabic');
      if (/\p{Script=Hebrew}/u.test(s)) seen.add('hebrew');
      if (/\p{Script=Devanagari}/u.test(s)) seen.add('devanagari');
      if (/\p{M}/u.test(s)) seen.add('mark');
      if (/\p{Script=Han}/u.test(s)) seen.add('han');
      if (/[\p{Script=Hiragana}\p{Script=Katakana}]/u.test(s)) seen.add('kana');
      if (/\p{Script=Hangul}/u.test(s)) seen.add('hangul');
      if (/\p{Script=Thai}/u.test(s)) seen.add('thai');
    }
    expect([...seen].sort()).toEqual(['arabic', 'bidi', 'devanagari', 'han', 'hangul', 'hebrew', 'kana', 'mark', 'surrogate', 'tex', 'thai']);
  });
});

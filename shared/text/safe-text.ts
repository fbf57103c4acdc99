/**
 * User text (joint and member tags, case and combination names, clauses, notes, words read from
 * a drawing) on its way to the screen, the calc sheet and KaTeX. Two functions, and every such
 * string goes through them:
 *
 * - `plainText` neutralises what would reorder or hide text: bidirectional controls
 *   (U+202A–U+202E embeddings and overrides, U+2066–U+2069 isolates, U+200E/U+200F marks,
 *   U+061C Arabic letter mark) are removed; C0/C1 control characters and line/paragraph
 *   separators become a space; a lone surrogate becomes U+FFFD; the result is in NFC.
 * - `texText` turns plain text into KaTeX source that typesets exactly those characters, in math
 *   or in text mode (`\text{…}` with every special character escaped).
 *
 * Pure: no I/O.
 */

/** Bidirectional formatting controls: embeddings, overrides, isolates, marks. */
const BIDI_CONTROLS = /[\u202A-\u202E\u2066-\u2069\u200E\u200F\u061C]/g;
/** C0 and C1 controls, DEL, and the Unicode line and paragraph separators. */
const CONTROLS = /[\u0000-\u001F\u007F-\u009F\u2028\u2029]/g;
/** A high surrogate not followed by a low one, or a low one not preceded by a high one. */
const LONE_SURROGATE = /[\uD800-\uDBFF](?![\uDC00-\uDFFF])|(?<![\uD800-\uDBFF])[\uDC00-\uDFFF]/g;

/** Text safe to show anywhere: no bidi controls, no control characters, no lone surrogates, NFC. */
export function plainText(text: string): string {
  return text.replace(LONE_SURROGATE, '\uFFFD').replace(BIDI_CONTROLS, '').replace(CONTROLS, ' ').normalize('NFC');
}

/** True when `plainText` would change the text (for input checks that prefer to refuse). */
export function hasUnsafeText(text: string): boolean {
  return plainText(text) !== text.normalize('NFC');
}

/** Characters with a meaning in TeX, each with the text-mode source that prints it. */
const TEX_SPECIALS: Record<string, string> = {
  '\\': '\\textbackslash{}',
  '~': '\\textasciitilde{}',
  '^': '\\textasciicircum{}',
  '{': '\\{',
  '}': '\\}',
  '#': '\\#',
  $: '\\$',
  '%': '\\%',
  '&': '\\&',
  _: '\\_',
};

/**
 * One character of plain text as KaTeX text-mode source.
 * - TeX specials are escaped.
 * - A combining mark U+0300–U+036F (left after NFC) goes in as `\char`: KaTeX would otherwise
 *   read it as an accent command and refuse the ones it does not know (or one with no base).
 * - A hyphen after a hyphen gets an empty group between, so `--` stays two hyphens (no dash
 *   ligature).
 * - An apostrophe or grave accent after one of them (or a grave after ! or ?) gets an empty
 *   group between, so '' stays two quotes (a double prime, U1'') rather than one double quote.
 * - A space after a space goes in as a control space (`\ `), so a run of spaces keeps its width.
 */
function texChar(ch: string, previous: string): string {
  const special = TEX_SPECIALS[ch];
  if (special) return special;
  const code = ch.codePointAt(0) ?? 0;
  if (code >= 0x300 && code <= 0x36f) return `\\char"${code.toString(16).toUpperCase()}{}`;
  if (ch === '-' && previous === '-') return '{}-';
  // '' and `` would join into a double quote (and !` ?` into ¡ ¿): keep the characters apart.
  if ((ch === "'" || ch === '`') && (previous === "'" || previous === '`' || (ch === '`' && (previous === '!' || previous === '?')))) return `{}${ch}`;
  // TeX folds a run of spaces into one; a control space keeps each of them.
  if (ch === ' ' && previous === ' ') return '\\ ';
  return ch;
}

/**
 * KaTeX source that typesets `text` as upright text, in math mode or text mode:
 * `texText('A\\~1')` → `\text{A\textbackslash{}\textasciitilde{}1}`. The text is passed
 * through `plainText` first. Empty text gives `\text{}`.
 *
 * Known difference: KaTeX's text font prints the ASCII apostrophe and grave accent as the curly
 * quotes ’ and ‘ (as TeX does); every other character prints as itself.
 */
export function texText(text: string): string {
  const chars = Array.from(plainText(text));
  let out = '';
  let previous = '';
  for (const ch of chars) {
    out += texChar(ch, previous);
    previous = ch;
  }
  return `\\text{${out}}`;
}

import type { ExplodedText } from './explode';
import { sortIndicesByFloat, sortIndicesByInt } from './sort';

/** Spreadsheet-style names: 0 → A, 25 → Z, 26 → AA, 27 → AB, … */
export function tagOfIndex(i: number): string {
  // bijective base 26, letters least significant first; the string made in one call (an import
  // names up to 100 000 joints, and a string per letter shows in its time)
  const c = TAG_CODES;
  let k = 0;
  let n = i + 1;
  while (n > 0) {
    const r = (n - 1) % 26;
    c[k++] = 65 + r;
    n = (n - 1 - r) / 26;
  }
  switch (k) {
    case 1:
      return String.fromCharCode(c[0]);
    case 2:
      return String.fromCharCode(c[1], c[0]);
    case 3:
      return String.fromCharCode(c[2], c[1], c[0]);
    case 4:
      return String.fromCharCode(c[3], c[2], c[1], c[0]);
    default:
      return String.fromCharCode(...Array.from(c.subarray(0, k)).reverse());
  }
}

/** Scratch for {@link tagOfIndex}: 2⁵³ needs 12 letters. */
const TAG_CODES = new Uint16Array(16);

/** Member tag from its joints' tags: "BC" when both are one character, else "AA-B". */
export function memberTagOf(a: string, b: string): string {
  return a.length === 1 && b.length === 1 ? a + b : `${a}-${b}`;
}

/** A text that can name a joint: 1 to 12 visible characters, no spaces. */
export function isTagLike(s: string): boolean {
  return s.length >= 1 && s.length <= 12 && /^[^\s]+$/.test(s);
}

/**
 * Reading order of joints: rows from top to bottom (a joint within `rowTol` below the row's
 * top joint belongs to the row), left to right within a row. Returns joint indices.
 */
export function readingOrder(xy: Float64Array, rowTol: number): Int32Array {
  const n = xy.length / 2;
  const xs = new Float64Array(n);
  const downs = new Float64Array(n); // −y, so that ascending means top first
  for (let i = 0; i < n; i++) {
    xs[i] = xy[2 * i];
    downs[i] = -xy[2 * i + 1];
  }
  // top to bottom; rows only need the heights in order, so ties may stay as they are
  const byY = new Int32Array(n);
  for (let i = 0; i < n; i++) byY[i] = i;
  sortIndicesByFloat(byY, downs);
  const row = new Int32Array(n);
  let r = -1;
  let top = Infinity;
  for (const i of byY) {
    const y = xy[2 * i + 1];
    if (y < top - rowTol) {
      r++;
      top = y;
    }
    row[i] = r;
  }
  // rows in turn, left to right: a stable sort by x, then by row. Two joints never share both
  // x and y, so x ties within a row keep byY's top-first order.
  sortIndicesByFloat(byY, xs);
  sortIndicesByInt(byY, row, r + 1);
  return byY;
}

export interface TagResult {
  /** Tags taken from texts, by joint index. */
  textTags: Map<number, string>;
  /** Joints whose tag came from a text. */
  fromText: number[];
  /** Texts not used, with why. */
  unused: { text: ExplodedText; reason: string }[];
}

/**
 * Tags joints from texts: a tag-like TEXT/MTEXT whose estimated centre lies within 2.5 text
 * heights plus half its width of a joint names the nearest such joint (closest pairs first,
 * each text and joint used once, a tag string only once). The other joints are named by
 * {@link jointTagsInOrder}.
 */
export function assignTags(xy: Float64Array, texts: ExplodedText[], tol: number): TagResult {
  const n = xy.length / 2;
  // tags taken from texts, by joint; most drawings have none or a few
  const textTag = new Map<number, string>();
  const fromText: number[] = [];
  const unused: TagResult['unused'] = [];
  // joints sorted by x for range queries (none needed without texts)
  const byX = new Int32Array(texts.length > 0 ? n : 0);
  for (let i = 0; i < byX.length; i++) byX[i] = i;
  const xs = new Float64Array(byX.length);
  for (let i = 0; i < byX.length; i++) xs[i] = xy[2 * i];
  sortIndicesByFloat(byX, xs);
  for (let k = 0; k < byX.length; k++) xs[k] = xy[2 * byX[k]];
  const pairs: { d: number; t: number; j: number }[] = [];
  const candidate: boolean[] = [];
  texts.forEach((t, ti) => {
    const ok = isTagLike(t.text);
    candidate.push(ok);
    if (!ok) return;
    const w = 0.6 * t.height * t.text.length;
    const r = Math.max(2.5 * t.height + w / 2, 2 * tol);
    let lo = 0;
    let hi = n;
    while (lo < hi) {
      const mid = (lo + hi) >> 1;
      if (xs[mid] < t.x - r) lo = mid + 1;
      else hi = mid;
    }
    for (let k = lo; k < n && xs[k] <= t.x + r; k++) {
      const j = byX[k];
      const d = Math.hypot(xy[2 * j] - t.x, xy[2 * j + 1] - t.y);
      if (d <= r) pairs.push({ d, t: ti, j });
    }
  });
  pairs.sort((p, q) => p.d - q.d || p.t - q.t || p.j - q.j);
  const textUsed = new Uint8Array(texts.length);
  const used = new Set<string>();
  const duplicate = new Uint8Array(texts.length);
  for (const p of pairs) {
    if (textUsed[p.t] || textTag.has(p.j)) continue;
    const s = texts[p.t].text;
    if (used.has(s)) {
      duplicate[p.t] = 1;
      continue;
    }
    textTag.set(p.j, s);
    used.add(s);
    textUsed[p.t] = 1;
    fromText.push(p.j);
  }
  texts.forEach((t, ti) => {
    if (textUsed[ti]) return;
    unused.push({
      text: t,
      reason: !candidate[ti] ? 'not a joint label' : duplicate[ti] ? 'repeats a label already used' : 'not near a joint',
    });
  });
  fromText.sort((a, b) => a - b);
  return { textTags: textTag, fromText, unused };
}

/**
 * Every joint's tag, joints in reading order: the tag a text gave it (`textTags`, by position
 * in that order), else A, B, C, … in reading order, skipping strings a text already took.
 */
export function jointTagsInOrder(count: number, textTags: ReadonlyMap<number, string>): string[] {
  const taken = new Set(textTags.values());
  // arrays filled by push: new Array(n) past 100 000 items is a slow dictionary-mode array (V8)
  const tags: string[] = [];
  let next = 0;
  for (let r = 0; r < count; r++) {
    const t = textTags.size > 0 ? textTags.get(r) : undefined;
    if (t !== undefined) {
      tags.push(t);
      continue;
    }
    let s = tagOfIndex(next++);
    while (taken.size > 0 && taken.has(s)) s = tagOfIndex(next++);
    tags.push(s);
  }
  return tags;
}

/**
 * Linear-time stable sorts of index lists by numeric keys, for the large sorts of an import
 * (joints in reading order, members by their joints) where a comparator sort would call back
 * millions of times.
 */

const LITTLE_ENDIAN = new Uint8Array(new Uint16Array([1]).buffer)[0] === 1;

/**
 * Sorts `idx` in place, stably, by `keys[idx[p]]` ascending. Keys must be finite or ±∞ (no
 * NaN); −0 and +0 count as equal, as they do for a comparator `a − b`. LSD radix sort on the
 * keys' IEEE-754 bits made order-preserving (sign flipped, negatives inverted), 16 bits a pass;
 * passes whose digit is the same for every index are skipped.
 */
export function sortIndicesByFloat(idx: Int32Array, keys: Float64Array): void {
  if (idx.length < 2) return;
  const { hi, lo } = floatSortBits(keys);
  radixPasses(idx, [lo, lo, hi, hi], [0, 16, 0, 16]);
}

/** The keys' IEEE-754 bits made order-preserving, as high and low words. */
function floatSortBits(keys: Float64Array): { hi: Uint32Array; lo: Uint32Array } {
  const m = keys.length;
  const f = new Float64Array(1);
  const u = new Uint32Array(f.buffer);
  const hiW = LITTLE_ENDIAN ? 1 : 0;
  const loW = 1 - hiW;
  const hi = new Uint32Array(m);
  const lo = new Uint32Array(m);
  for (let k = 0; k < m; k++) {
    f[0] = keys[k] + 0; // −0 → +0
    let h = u[hiW];
    let l = u[loW];
    if (h & 0x80000000) {
      h = ~h >>> 0;
      l = ~l >>> 0;
    } else {
      h = (h | 0x80000000) >>> 0;
    }
    hi[k] = h;
    lo[k] = l;
  }
  return { hi, lo };
}

/**
 * Sorts `idx` in place, stably, by small non-negative integer keys `keys[idx[p]]` < 2³¹. With
 * `range` (every key below it, and not much more than there are indices), one counting pass.
 */
export function sortIndicesByInt(idx: Int32Array, keys: Int32Array, range?: number): void {
  if (idx.length < 2) return;
  if (range !== undefined && range <= 4 * idx.length + 65_536) {
    countingPass(idx, keys, range);
    return;
  }
  const w = new Uint32Array(keys.buffer, keys.byteOffset, keys.length);
  radixPasses(idx, [w, w], [0, 16]);
}

function radixPasses(idx: Int32Array, words: Uint32Array[], shifts: number[]): void {
  const n = idx.length;
  let src: Int32Array = idx;
  let dst: Int32Array = new Int32Array(n);
  const count = new Int32Array(65537);
  for (let pass = 0; pass < words.length; pass++) {
    const word = words[pass];
    const shift = shifts[pass];
    count.fill(0);
    for (let p = 0; p < n; p++) count[((word[src[p]] >>> shift) & 0xffff) + 1]++;
    // a digit shared by every index leaves the order as it is
    if (count[((word[src[0]] >>> shift) & 0xffff) + 1] === n) continue;
    for (let d = 0; d < 65536; d++) count[d + 1] += count[d];
    for (let p = 0; p < n; p++) dst[count[(word[src[p]] >>> shift) & 0xffff]++] = src[p];
    const t = src;
    src = dst;
    dst = t;
  }
  if (src !== idx) idx.set(src);
}

function countingPass(idx: Int32Array, keys: Int32Array, range: number): void {
  const n = idx.length;
  const start = new Int32Array(range + 1);
  for (let p = 0; p < n; p++) start[keys[idx[p]] + 1]++;
  for (let v = 0; v < range; v++) start[v + 1] += start[v];
  const out = new Int32Array(n);
  for (let p = 0; p < n; p++) {
    const i = idx[p];
    out[start[keys[i]]++] = i;
  }
  idx.set(out);
}

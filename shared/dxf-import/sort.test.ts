// The radix sorts of sort.ts checked against the JavaScript engine's own stable comparator sort
// (Array.prototype.sort, stable since ECMAScript 2019, ECMA-262 §23.1.3.30) on seeded random keys.
import { describe, expect, it } from 'vitest';
import { sortIndicesByFloat, sortIndicesByInt } from './sort';

/** Seeded linear congruential generator (Numerical Recipes constants), values in [0, 1). */
function lcg(seed: number): () => number {
  let s = seed >>> 0;
  return () => (s = (Math.imul(s, 1664525) + 1013904223) >>> 0) / 2 ** 32;
}

function referenceOrder(n: number, key: (i: number) => number): number[] {
  return Array.from({ length: n }, (_, i) => i).sort((p, q) => key(p) - key(q));
}

describe('sortIndicesByFloat', () => {
  it('when keys mix signs, zeros, repeats, tiny and huge values, then the order is the stable comparator order', () => {
    const rnd = lcg(7);
    const pool = [0, -0, 1, -1, 1e-300, -1e-300, 5e-324, 1e300, -1e300, Infinity, -Infinity, 2.5, -2.5];
    const n = 5000;
    const keys = Float64Array.from({ length: n }, () => (rnd() < 0.5 ? pool[Math.floor(rnd() * pool.length)] : (rnd() - 0.5) * 10 ** Math.floor(rnd() * 12 - 6)));
    const idx = Int32Array.from({ length: n }, (_, i) => i);
    sortIndicesByFloat(idx, keys);
    expect(Array.from(idx)).toEqual(referenceOrder(n, (i) => keys[i]));
  });

  it('when a second key is sorted after a first, then ties of the second keep the first key order', () => {
    const rnd = lcg(11);
    const n = 3000;
    const a = Float64Array.from({ length: n }, () => Math.floor(rnd() * 20) - 10);
    const b = Float64Array.from({ length: n }, () => Math.floor(rnd() * 5) * 0.1);
    const idx = Int32Array.from({ length: n }, (_, i) => i);
    sortIndicesByFloat(idx, a);
    sortIndicesByFloat(idx, b);
    const ref = Array.from({ length: n }, (_, i) => i).sort((p, q) => b[p] - b[q] || a[p] - a[q]);
    expect(Array.from(idx)).toEqual(ref);
  });
});

describe('sortIndicesByInt', () => {
  it('when keys span more than 16 bits with many repeats, then the order is the stable comparator order', () => {
    const rnd = lcg(3);
    const n = 4000;
    const keys = Int32Array.from({ length: n }, () => (rnd() < 0.3 ? 70_000 : Math.floor(rnd() * 200_000)));
    const idx = Int32Array.from({ length: n }, (_, i) => i);
    sortIndicesByInt(idx, keys);
    expect(Array.from(idx)).toEqual(referenceOrder(n, (i) => keys[i]));
  });
});

describe('sortIndicesByInt with a key range (one counting pass)', () => {
  it('when keys lie below the range given, then the order is the stable comparator order', () => {
    const rnd = lcg(5);
    const n = 6000;
    const range = 9000;
    const keys = Int32Array.from({ length: n }, () => Math.floor(rnd() * range));
    const idx = Int32Array.from({ length: n }, (_, i) => n - 1 - i);
    sortIndicesByInt(idx, keys, range);
    const ref = Array.from({ length: n }, (_, i) => n - 1 - i).sort((p, q) => keys[p] - keys[q]);
    expect(Array.from(idx)).toEqual(ref);
  });
});

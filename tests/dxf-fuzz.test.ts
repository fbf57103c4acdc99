// Fuzzing the parse path: seeded truncations, byte flips and line swaps of the test drawings go
// through dxfParseBytes + dxfImport. Each must finish (the test timeout catches a hang) and
// either import or refuse with a DxfImportError carrying a code and a sentence — never any
// other exception. PRNG: mulberry32 (a public-domain 32-bit generator, from memory).
import { readdirSync, readFileSync } from 'node:fs';
import path from 'node:path';
import { describe, expect, it } from 'vitest';
import { dxfImport, dxfLayers, dxfParseBytes, isDxfImportError } from '@shared/dxf-import';
import { block, blockBomb, deepNesting, dxf, insert, line, lineWithoutEnd, mutualInsert, selfInsert } from './support/hostile-dxf';
import { kingPostInches, pitchedTrussMm } from './fixtures/dxf/writer-drawings';

function mulberry32(seed: number): () => number {
  let a = seed >>> 0;
  return () => {
    a = (a + 0x6d2b79f5) >>> 0;
    let t = a;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}

const dir = path.resolve(__dirname, 'fixtures/dxf');
const fixtures = readdirSync(dir)
  .filter((f) => f.endsWith('.dxf'))
  .sort()
  .map((f) => ({ name: f, bytes: new Uint8Array(readFileSync(path.join(dir, f))) }))
  .concat([
    { name: 'pitched truss (@tarikjabiri/dxf)', bytes: new TextEncoder().encode(pitchedTrussMm()) },
    { name: 'king-post truss (dxf-writer)', bytes: new TextEncoder().encode(kingPostInches()) },
  ]);

function variants(bytes: Uint8Array, rnd: () => number, count: number): { how: string; bytes: Uint8Array }[] {
  const out: { how: string; bytes: Uint8Array }[] = [];
  const digits = '0123456789-.eE';
  for (let k = 0; k < count; k++) {
    const kind = k % 4;
    if (kind === 0) {
      const at = Math.floor(rnd() * bytes.length);
      out.push({ how: `truncated at byte ${at}`, bytes: bytes.slice(0, at) });
    } else if (kind === 1 || kind === 2) {
      const b = bytes.slice();
      const flips = 1 + Math.floor(rnd() * 4);
      const where: number[] = [];
      for (let f = 0; f < flips; f++) {
        const at = Math.floor(rnd() * b.length);
        // kind 1: any byte; kind 2: a plausible character, which gets deeper into the parser
        b[at] = kind === 1 ? Math.floor(rnd() * 256) : digits.charCodeAt(Math.floor(rnd() * digits.length));
        where.push(at);
      }
      out.push({ how: `bytes changed at ${where.join(', ')}`, bytes: b });
    } else {
      const lines = new TextDecoder('latin1').decode(bytes).split('\n');
      const i = Math.floor(rnd() * lines.length);
      const j = Math.floor(rnd() * lines.length);
      const t = lines[i];
      lines[i] = lines[j];
      lines[j] = t;
      if (rnd() < 0.5) lines.splice(Math.floor(rnd() * lines.length), 1);
      out.push({ how: `lines ${i + 1} and ${j + 1} swapped`, bytes: Uint8Array.from(lines.join('\n'), (c) => c.charCodeAt(0) & 0xff) });
    }
  }
  return out;
}

describe('fuzzed drawings', () => {
  it('when a few hundred damaged variants of the fixtures are imported, then each imports or fails with a DxfImportError', () => {
    expect(fixtures.length).toBeGreaterThanOrEqual(4);
    const rnd = mulberry32(Number(process.env.DXF_FUZZ_SEED ?? 20240611));
    const perFixture = Number(process.env.DXF_FUZZ_COUNT ?? 100);
    let refused = 0;
    let imported = 0;
    const codes = new Set<string>();
    for (const f of fixtures) {
      for (const v of variants(f.bytes, rnd, perFixture)) {
        try {
          const parsed = dxfParseBytes(v.bytes);
          dxfLayers(parsed); // the upload lists layers first: the same must hold there
          dxfImport(parsed, { units: 'mm' });
          imported++;
        } catch (e) {
          if (!isDxfImportError(e)) {
            throw new Error(`${f.name}, ${v.how}: ${e instanceof Error ? `${e.name}: ${e.message}` : String(e)}`);
          }
          expect(e.message.length, `${f.name}, ${v.how}`).toBeGreaterThan(20);
          expect(e.message, `${f.name}, ${v.how}`).not.toMatch(/\n\s+at /);
          codes.add(e.code);
          refused++;
        }
      }
    }
    expect(imported + refused).toBe(perFixture * fixtures.length);
    // the variants really reach the checks: truncations are refused, some flips still import
    expect(codes.has('truncated')).toBe(true);
    expect(refused).toBeGreaterThan(0);
    expect(imported).toBeGreaterThan(0);
  });
});

/** A random drawing of blocks inserting blocks (cycles, deep chains, arrays, missing ends allowed). */
function randomBlockDrawing(rnd: () => number): Buffer {
  const nBlocks = 1 + Math.floor(rnd() * 8);
  const names = Array.from({ length: nBlocks }, (_, i) => `K${i}`);
  const blocks = names.map((name) => {
    const body: string[][] = [];
    const items = 1 + Math.floor(rnd() * 6);
    for (let k = 0; k < items; k++) {
      const r = rnd();
      if (r < 0.45) body.push(line(rnd() * 10, rnd() * 10, rnd() * 10, rnd() * 10));
      else if (r < 0.5) body.push(lineWithoutEnd(rnd(), rnd()));
      else if (r < 0.55) body.push(line(1, 1, 1, 1));
      else body.push(insert(names[Math.floor(rnd() * nBlocks)], rnd() * 20, rnd() * 20));
    }
    return block(name, body);
  });
  const top: string[][] = [line(0, 0, 1000, 0)];
  const inserts = 1 + Math.floor(rnd() * 4);
  for (let k = 0; k < inserts; k++) top.push(insert(names[Math.floor(rnd() * nBlocks)], rnd() * 100, rnd() * 100));
  return dxf(top, blocks);
}

describe('fuzzed hostile drawings (block graphs)', () => {
  // Several fixed seeds, 2 000 drawings in all, plus mutations of the worst cases; every one
  // either lists its layers and imports, or is refused with a DxfImportError, and none takes long.
  const seeds = [7, 1103, 2026, 424242];
  it('2 000 random block graphs and their damaged copies: 0 crashes, 0 hangs', () => {
    let count = 0;
    let slowest = 0;
    const codes = new Set<string>();
    for (const seed of seeds) {
      const rnd = mulberry32(seed);
      const bases = [selfInsert(), mutualInsert(), deepNesting(36), blockBomb(9, 5)];
      for (let k = 0; k < 500; k++) {
        const base = k < 420 ? randomBlockDrawing(rnd) : bases[k % bases.length];
        const v = k % 3 === 0 ? base : variants(new Uint8Array(base), rnd, 1 + (k % 3))[k % 3 === 1 ? 0 : 1].bytes;
        const t = performance.now();
        try {
          const parsed = dxfParseBytes(new Uint8Array(v));
          dxfLayers(parsed);
          dxfImport(parsed, { units: 'mm' });
        } catch (e) {
          if (!isDxfImportError(e)) throw new Error(`seed ${seed}, drawing ${k}: ${e instanceof Error ? `${e.name}: ${e.message}` : String(e)}`);
          expect(e.message.length).toBeGreaterThan(20);
          codes.add(e.code);
        }
        slowest = Math.max(slowest, performance.now() - t);
        count++;
      }
    }
    expect(count).toBe(2000);
    // the generator reaches the block checks, not only the parser
    expect(codes.has('block-problem')).toBe(true);
    expect(codes.has('drawing-too-large')).toBe(true);
    expect(slowest).toBeLessThan(10_000);
  });
});

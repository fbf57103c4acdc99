/**
 * Small hand-written ASCII DXF files for hostile-input tests (group codes per the DXF
 * reference's general structure, from memory): a HEADER with $INSUNITS, BLOCKS, ENTITIES.
 */
const pairs = (...kv: (string | number)[]) => {
  const out: string[] = [];
  for (let i = 0; i < kv.length; i += 2) out.push(String(kv[i]), String(kv[i + 1]));
  return out;
};

export const line = (x1: number, y1: number, x2: number, y2: number, layer = 'TRUSS') =>
  pairs(0, 'LINE', 8, layer, 10, x1, 20, y1, 30, 0, 11, x2, 21, y2, 31, 0);
/** A LINE whose end point is missing. */
export const lineWithoutEnd = (x1: number, y1: number, layer = 'TRUSS') => pairs(0, 'LINE', 8, layer, 10, x1, 20, y1, 30, 0);
export const insert = (name: string, x = 0, y = 0, layer = 'TRUSS') => pairs(0, 'INSERT', 8, layer, 2, name, 10, x, 20, y, 30, 0);

export function block(name: string, body: string[][]): string[] {
  return [...pairs(0, 'BLOCK', 8, '0', 2, name, 70, 0, 10, 0, 20, 0, 30, 0, 3, name), ...body.flat(), ...pairs(0, 'ENDBLK', 8, '0')];
}

export function dxf(entities: string[][], blocks: string[][] = []): Buffer {
  const text = [
    ...pairs(0, 'SECTION', 2, 'HEADER', 9, '$INSUNITS', 70, 6, 0, 'ENDSEC'),
    ...pairs(0, 'SECTION', 2, 'BLOCKS'),
    ...blocks.flat(),
    ...pairs(0, 'ENDSEC', 0, 'SECTION', 2, 'ENTITIES'),
    ...entities.flat(),
    ...pairs(0, 'ENDSEC', 0, 'EOF'),
  ].join('\r\n');
  return Buffer.from(`${text}\r\n`, 'latin1');
}

/** Blocks nested `depth` deep, each inserting the next `fanOut` times: fanOut^depth segments from a few kB. */
export function blockBomb(depth: number, fanOut: number): Buffer {
  const blocks: string[][] = [block('B0', [line(0, 0, 1, 0), line(1, 0, 1, 1)])];
  for (let d = 1; d <= depth; d++) {
    blocks.push(block(`B${d}`, Array.from({ length: fanOut }, (_, i) => insert(`B${d - 1}`, i * 2, 0))));
  }
  return dxf([insert(`B${depth}`)], blocks);
}

export const selfInsert = () => dxf([insert('LOOP')], [block('LOOP', [line(0, 0, 1, 0), insert('LOOP', 1, 0)])]);
export const mutualInsert = () => dxf([insert('A')], [block('A', [line(0, 0, 1, 0), insert('B')]), block('B', [line(0, 0, 0, 1), insert('A')])]);
export function deepNesting(depth: number): Buffer {
  const blocks: string[][] = [block('N0', [line(0, 0, 1, 0)])];
  for (let d = 1; d <= depth; d++) blocks.push(block(`N${d}`, [insert(`N${d - 1}`)]));
  return dxf([insert(`N${depth}`)], blocks);
}
export const zeroLengthOnly = () => dxf([line(1, 1, 1, 1), line(2, 2, 2, 2), line(0, 0, 0, 0)]);
export const lineMissingEnd = () => dxf([line(0, 0, 1, 0), lineWithoutEnd(1, 0)]);

/**
 * A POLYLINE with VERTEX records (group 70 flag 8 = 3D polyline, vertex flag 32 = 3D polyline
 * vertex; DXF Reference, Autodesk, POLYLINE and VERTEX, from memory), closed by SEQEND.
 */
export function polyline(vertices: [number, number, number][], layer = 'TRUSS', flags = 8): string[] {
  const out = pairs(0, 'POLYLINE', 5, '2F', 8, layer, 66, 1, 70, flags, 10, 0, 20, 0, 30, 0);
  for (const [x, y, z] of vertices) out.push(...pairs(0, 'VERTEX', 8, layer, 10, x, 20, y, 30, z, 70, flags & 8 ? 32 : 0));
  out.push(...pairs(0, 'SEQEND', 8, layer));
  return out;
}

/** A CIRCLE: something that is not a line. */
export const circle = (x: number, y: number, r: number, layer = 'TRUSS') => pairs(0, 'CIRCLE', 8, layer, 10, x, 20, y, 30, 0, 40, r);

/** {@link dxf} with another $INSUNITS (0: unitless, as every R12 file). */
export function dxfIn(insunits: number, entities: string[][]): Buffer {
  const text = [
    ...pairs(0, 'SECTION', 2, 'HEADER', 9, '$INSUNITS', 70, insunits, 0, 'ENDSEC'),
    ...pairs(0, 'SECTION', 2, 'ENTITIES'),
    ...entities.flat(),
    ...pairs(0, 'ENDSEC', 0, 'EOF'),
  ].join('\r\n');
  return Buffer.from(`${text}\r\n`, 'latin1');
}

/**
 * A parallel-chord truss of `panels` panels, `a` by `h` (drawing units), chords per panel on
 * `chordLayer`, posts and one diagonal per panel (rising to the middle) on `webLayer`;
 * `skipDiagonal` leaves panel k (0-based) open.
 */
export function parallelChordTruss(opts: { panels: number; a: number; h: number; chordLayer?: string; topLayer?: string; bottomLayer?: string; webLayer?: string; skipDiagonal?: number }): string[][] {
  const { panels, a, h, skipDiagonal } = opts;
  const top = opts.topLayer ?? opts.chordLayer ?? 'CHORDS';
  const bottom = opts.bottomLayer ?? opts.chordLayer ?? 'CHORDS';
  const web = opts.webLayer ?? 'WEBS';
  const out: string[][] = [];
  for (let i = 0; i < panels; i++) {
    out.push(line(i * a, 0, (i + 1) * a, 0, bottom), line(i * a, h, (i + 1) * a, h, top));
    if (i !== skipDiagonal) out.push(i < panels / 2 ? line(i * a, 0, (i + 1) * a, h, web) : line(i * a, h, (i + 1) * a, 0, web));
  }
  for (let i = 0; i <= panels; i++) out.push(line(i * a, 0, i * a, h, web));
  return out;
}

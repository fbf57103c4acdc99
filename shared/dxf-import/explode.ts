import type { IDxf, IBlock, IEntity } from 'dxf-parser';
import { DxfImportError } from './errors';

/**
 * 2-D affine map [a, b, c, d, e, f]: (x, y) → (a·x + c·y + e, b·x + d·y + f).
 */
export type Affine = readonly [number, number, number, number, number, number];

export const AFFINE_IDENTITY: Affine = [1, 0, 0, 1, 0, 0];

/** p ↦ outer(inner(p)). */
export function affineCompose(outer: Affine, inner: Affine): Affine {
  const [a1, b1, c1, d1, e1, f1] = outer;
  const [a2, b2, c2, d2, e2, f2] = inner;
  return [
    a1 * a2 + c1 * b2,
    b1 * a2 + d1 * b2,
    a1 * c2 + c1 * d2,
    b1 * c2 + d1 * d2,
    a1 * e2 + c1 * f2 + e1,
    b1 * e2 + d1 * f2 + f1,
  ];
}

/**
 * The map of a block reference: block coordinates → coordinates of the space holding the
 * INSERT. DXF Reference (Autodesk), INSERT: the block's base point lands on the insertion point
 * (10/20), after scaling by 41/42 (negative = mirrored) and rotating by 50 degrees
 * counter-clockwise; array copies (70/71 columns/rows, 44/45 spacing) are offset along the
 * rotated axes without scaling.
 */
export function affineOfInsert(
  insertion: { x: number; y: number },
  base: { x: number; y: number },
  sx: number,
  sy: number,
  rotationDeg: number,
  offsetX = 0,
  offsetY = 0,
): Affine {
  const t = (rotationDeg * Math.PI) / 180;
  const cos = Math.cos(t);
  const sin = Math.sin(t);
  // R · (S · (p − base) + offset) + insertion
  const a = cos * sx;
  const b = sin * sx;
  const c = -sin * sy;
  const d = cos * sy;
  const ox = offsetX - sx * base.x;
  const oy = offsetY - sy * base.y;
  return [a, b, c, d, cos * ox - sin * oy + insertion.x, sin * ox + cos * oy + insertion.y];
}

/** Mirror in x: the object coordinate system of an entity whose extrusion is (0, 0, −1). */
const OCS_FLIPPED: Affine = [-1, 0, 0, 1, 0, 0];

/** A piece of text found while exploding, in output coordinates. */
export interface ExplodedText {
  text: string;
  /** Estimated centre of the text box. */
  x: number;
  y: number;
  /** Text height, output units. */
  height: number;
  layer: string;
  type: 'TEXT' | 'MTEXT';
}

/** Callbacks of {@link explodeDrawing}; coordinates in output units (the root map's image). */
export interface ExplodeSink {
  /**
   * A straight segment (LINE, or one span of a polyline); `bulged` when the span is an arc
   * drawn straight. `entity` is the source entity, for {@link describeEntity} in messages.
   */
  segment(layer: string, x1: number, y1: number, x2: number, y2: number, entity: object, bulged: boolean): void;
  text(t: ExplodedText): void;
  /** Any entity met (counted per type and layer); `point` is a representative place when known. */
  entity(type: string, layer: string, x: number | null, y: number | null): void;
  /** An entity that is not drawn into the model, with the reason. */
  ignored(type: string, reason: string, layer: string, x: number | null, y: number | null): void;
  /**
   * A polyline with 3D vertices that do not lie in one plane parallel to XY (see
   * {@link POLYLINE_FLAT_TOLERANCE}): `zMin`, `zMax` in output units, `spans` the straight spans it
   * would give. Its segments are not sent; the import refuses it when its layer is chosen.
   */
  notFlat(layer: string, entity: object, zMin: number, zMax: number, spans: number): void;
}

/**
 * A 3D polyline counts as flat (lying in one plane parallel to XY, read by dropping z) when the
 * range of its vertices' z is at most this fraction of the larger side of its box in plan:
 * 1/10 000, the same fraction as the default joining tolerance (common practice, no source).
 */
export const POLYLINE_FLAT_TOLERANCE = 1e-4;

/** Deepest nesting of blocks inside blocks taken by default; a safety limit, no source. */
export const MAX_BLOCK_DEPTH = 32;
/**
 * Most line segments a drawing may explode into by default (blocks inside blocks multiply
 * quickly: a 2.8 kB file can describe a million). Far above any truss drawing; a safety
 * limit, no source.
 */
export const MAX_EXPLODED_SEGMENTS = 200_000;

/**
 * The caps {@link explodeDrawing} enforces. The server takes them from the firm's settings
 * (an admin may raise them) and says where in `howToRaise`, which the refusal names.
 */
export interface DxfExplodeLimits {
  /** Most line segments the exploded drawing may hold. */
  maxSegments: number;
  /** Deepest nesting of blocks inside blocks. */
  maxBlockDepth: number;
  /** How a person raises the caps, as the end of a sentence ("ask an admin to …"); none: not said. */
  howToRaise?: string;
}

export const DXF_DEFAULT_LIMITS: DxfExplodeLimits = { maxSegments: MAX_EXPLODED_SEGMENTS, maxBlockDepth: MAX_BLOCK_DEPTH };

/**
 * How many segments exploding the model space would give, counted over the block graph
 * before anything is exploded (each block counted once, then multiplied by its inserts), so
 * a drawing that would blow up memory is refused while it is still a few kilobytes. Stops
 * counting past `cap`. Self-reference and nesting depth are reported by the walk itself.
 */
function explosionSize(dxf: IDxf, cap: number, maxDepth: number): number {
  const blocks: Record<string, IBlock> = dxf.blocks ?? {};
  const memo = new Map<string, number>();
  const visiting = new Set<string>();
  const count = (entities: IEntity[] | undefined, depth: number): number => {
    let n = 0;
    for (const raw of entities ?? []) {
      const e = raw as AnyEntity;
      if (!e || typeof e.type !== 'string' || e.inPaperSpace) continue;
      if (e.type === 'LINE') n += 1;
      else if (e.type === 'LWPOLYLINE' || e.type === 'POLYLINE') n += Array.isArray(e.vertices) ? e.vertices.length : 0;
      else if (e.type === 'INSERT') {
        const name = typeof e.name === 'string' ? e.name : '';
        if (!blocks[name] || visiting.has(name) || depth >= maxDepth) continue; // the walk names these
        let inner = memo.get(name);
        if (inner === undefined) {
          visiting.add(name);
          inner = count(blocks[name].entities, depth + 1);
          visiting.delete(name);
          memo.set(name, inner);
        }
        const cols = Math.max(1, Math.min(10_000, Math.floor(num(e.columnCount, 1)) || 1));
        const rows = Math.max(1, Math.min(10_000, Math.floor(num(e.rowCount, 1)) || 1));
        n += inner * cols * rows;
      }
      if (n > cap) return n;
    }
    return n;
  };
  return count(dxf.entities, 0);
}

type AnyEntity = IEntity & Record<string, any>;

function handleOf(e: AnyEntity): string {
  return e.handle !== undefined ? String(e.handle) : '?';
}

/** "LINE (handle 2A, layer "TRUSS")": how messages name an entity. */
export function describeEntity(entity: object, layer: string): string {
  const e = entity as AnyEntity;
  return `${String(e.type)} (handle ${handleOf(e)}, layer "${layer}")`;
}

function describe(e: AnyEntity, layer: string): string {
  return `${e.type} (handle ${handleOf(e)}, layer "${layer}")`;
}

function num(v: unknown, fallback: number): number {
  return typeof v === 'number' ? v : fallback;
}

/** Sign of the extrusion z, or 0 when the entity does not lie in the drawing plane. */
function extrusionSign(dir: { x?: number; y?: number; z?: number } | undefined): number {
  if (!dir) return 1;
  const x = num(dir.x, 0);
  const y = num(dir.y, 0);
  const z = num(dir.z, 1);
  if (Math.abs(x) > 1e-9 || Math.abs(y) > 1e-9 || Math.abs(Math.abs(z) - 1) > 1e-9) return 0;
  return z < 0 ? -1 : 1;
}

/** Removes MTEXT inline formatting (\P, \f…;, braces, …) and leaves the plain words. */
export function mtextPlain(s: string): string {
  return s
    .replace(/\\[PpNn]/g, ' ')
    .replace(/\\[ACcFfHhLlOoKkQqTtWwSs][^;\\{}]*;?/g, '')
    .replace(/\\([\\{}])/g, '$1')
    .replace(/[{}]/g, '')
    .replace(/%%[cdpCDP]/g, '')
    .trim();
}

/**
 * Walks the model space of a parsed drawing, exploding block references (nested, with
 * scale, mirroring, rotation, base point and arrays) and calling `sink` for every segment,
 * text and entity, mapped by `root` (e.g. a unit scale). Paper-space entities are skipped and
 * reported as ignored. Entities on layer "0" inside a block take the layer of the INSERT that
 * places them (DXF convention, from memory).
 *
 * @throws DxfImportError 'block-problem' for a block that contains itself or nests deeper than
 *   `limits.maxBlockDepth` (default 32); 'drawing-too-large' when it would explode into more
 *   than `limits.maxSegments` segments (default 200 000).
 */
export function explodeDrawing(dxf: IDxf, root: Affine, sink: ExplodeSink, limits: Partial<DxfExplodeLimits> = {}): void {
  const blocks: Record<string, IBlock> = dxf.blocks ?? {};
  const stack: string[] = [];
  const maxSegments = limits.maxSegments ?? MAX_EXPLODED_SEGMENTS;
  const maxDepth = limits.maxBlockDepth ?? MAX_BLOCK_DEPTH;
  const orRaise = limits.howToRaise ? `, or ${limits.howToRaise}` : '';
  const size = explosionSize(dxf, maxSegments, maxDepth);
  if (size > maxSegments) {
    throw new DxfImportError(
      'drawing-too-large',
      `This drawing explodes into more than ${maxSegments.toLocaleString('en-US')} line segments (blocks inserted inside blocks), the most Panelpoint takes; upload a drawing of the one truss with its blocks exploded${orRaise}.`,
    );
  }

  const walk = (entities: IEntity[] | undefined, m: Affine, parentLayer: string | null): void => {
    if (!entities) return;
    for (const raw of entities) {
      const e = raw as AnyEntity;
      if (!e || typeof e.type !== 'string') continue;
      let layer = typeof e.layer === 'string' && e.layer !== '' ? e.layer : '0';
      if (parentLayer !== null && layer === '0') layer = parentLayer;
      if (e.inPaperSpace) {
        sink.ignored(e.type, 'in paper space', layer, null, null);
        continue;
      }
      switch (e.type) {
        case 'LINE':
          doLine(e, m, layer);
          break;
        case 'LWPOLYLINE':
          doPolyline(e, m, layer, extrusionSign({ x: e.extrusionDirectionX, y: e.extrusionDirectionY, z: e.extrusionDirectionZ }));
          break;
        case 'POLYLINE':
          if (e.is3dPolygonMesh || e.isPolyfaceMesh) {
            const v = e.vertices?.[0];
            const p = v ? apply(m, num(v.x, 0), num(v.y, 0)) : null;
            sink.ignored('POLYLINE', 'mesh', layer, p?.[0] ?? null, p?.[1] ?? null);
          } else if (e.is3dPolyline || hasVertexZ(e)) {
            // A 3D polyline's vertices are in world coordinates (DXF Reference, Autodesk, POLYLINE
            // flag 8): flat ones are read in plan, others refused by the import with their z range.
            do3dPolyline(e, m, layer);
          } else if (e.includesCurveFitVertices || e.includesSplineFitVertices) {
            const v = e.vertices?.[0];
            const p = v ? apply(m, num(v.x, 0), num(v.y, 0)) : null;
            sink.ignored('POLYLINE', 'curve-fitted polyline', layer, p?.[0] ?? null, p?.[1] ?? null);
          } else {
            doPolyline(e, m, layer, extrusionSign(e.extrusionDirection));
          }
          break;
        case 'INSERT':
          doInsert(e, m, layer);
          break;
        case 'TEXT':
        case 'MTEXT':
          doText(e, m, layer);
          break;
        default: {
          const p = representativePoint(e);
          const q = p ? apply(m, p.x, p.y) : null;
          sink.entity(e.type, layer, q?.[0] ?? null, q?.[1] ?? null);
          sink.ignored(e.type, 'not a straight line', layer, q?.[0] ?? null, q?.[1] ?? null);
        }
      }
    }
  };

  const apply = (m: Affine, x: number, y: number): [number, number] => [
    m[0] * x + m[2] * y + m[4],
    m[1] * x + m[3] * y + m[5],
  ];

  const doLine = (e: AnyEntity, m: Affine, layer: string) => {
    const v = e.vertices as { x: number; y: number }[] | undefined;
    if (!v || v.length < 2) {
      throw new DxfImportError('bad-coordinate', `The ${describe(e, layer)} lacks a start or end point. Fix or delete it in your CAD program and upload again.`);
    }
    const x1 = num(v[0].x, NaN);
    const y1 = num(v[0].y, NaN);
    const x2 = num(v[1].x, NaN);
    const y2 = num(v[1].y, NaN);
    sink.entity('LINE', layer, m[0] * x1 + m[2] * y1 + m[4], m[1] * x1 + m[3] * y1 + m[5]);
    sink.segment(
      layer,
      m[0] * x1 + m[2] * y1 + m[4],
      m[1] * x1 + m[3] * y1 + m[5],
      m[0] * x2 + m[2] * y2 + m[4],
      m[1] * x2 + m[3] * y2 + m[5],
      e,
      false,
    );
  };

  const doPolyline = (e: AnyEntity, m0: Affine, layer: string, ext: number) => {
    const verts = (e.vertices ?? []) as { x?: number; y?: number; bulge?: number }[];
    const first = verts[0];
    if (ext === 0) {
      sink.ignored(e.type, 'not in the drawing plane', layer, null, null);
      return;
    }
    const m = ext < 0 ? affineCompose(m0, OCS_FLIPPED) : m0;
    const p0 = first ? apply(m, num(first.x, NaN), num(first.y, NaN)) : null;
    sink.entity(e.type, layer, p0?.[0] ?? null, p0?.[1] ?? null);
    if (verts.length < 2) {
      sink.ignored(e.type, 'fewer than two vertices', layer, p0?.[0] ?? null, p0?.[1] ?? null);
      return;
    }
    const closed = e.shape === true;
    const n = verts.length;
    const spans = closed ? n : n - 1;
    for (let i = 0; i < spans; i++) {
      const a = verts[i];
      const b = verts[(i + 1) % n];
      const [x1, y1] = apply(m, num(a.x, NaN), num(a.y, NaN));
      const [x2, y2] = apply(m, num(b.x, NaN), num(b.y, NaN));
      const bulged = typeof a.bulge === 'number' && a.bulge !== 0;
      sink.segment(layer, x1, y1, x2, y2, e, bulged);
    }
  };

  const do3dPolyline = (e: AnyEntity, m: Affine, layer: string) => {
    const verts = (e.vertices ?? []) as { x?: number; y?: number; z?: number }[];
    let zMin = Infinity;
    let zMax = -Infinity;
    let xMin = Infinity;
    let xMax = -Infinity;
    let yMin = Infinity;
    let yMax = -Infinity;
    for (const v of verts) {
      const z = num(v.z, 0);
      const x = num(v.x, 0);
      const y = num(v.y, 0);
      if (z < zMin) zMin = z;
      if (z > zMax) zMax = z;
      if (x < xMin) xMin = x;
      if (x > xMax) xMax = x;
      if (y < yMin) yMin = y;
      if (y > yMax) yMax = y;
    }
    const side = Math.max(xMax - xMin, yMax - yMin);
    if (verts.length >= 2 && zMax - zMin > POLYLINE_FLAT_TOLERANCE * side) {
      // z scales with the drawing's units as x and y do (the map's scale, no rotation in z)
      const k = Math.sqrt(Math.abs(m[0] * m[3] - m[1] * m[2]));
      const first = verts[0];
      const p0 = apply(m, num(first.x, NaN), num(first.y, NaN));
      sink.entity(e.type, layer, p0[0], p0[1]);
      sink.notFlat(layer, e, zMin * k, zMax * k, e.shape === true ? verts.length : verts.length - 1);
      return;
    }
    doPolyline(e, m, layer, 1);
  };

  const doInsert = (e: AnyEntity, m0: Affine, layer: string) => {
    const name = typeof e.name === 'string' ? e.name : '';
    const block = blocks[name];
    const pos = e.position ?? { x: 0, y: 0 };
    const ext = extrusionSign(e.extrusionDirection);
    const m = ext < 0 ? affineCompose(m0, OCS_FLIPPED) : m0;
    const here = apply(m, num(pos.x, NaN), num(pos.y, NaN));
    sink.entity('INSERT', layer, here[0], here[1]);
    if (ext === 0) {
      sink.ignored('INSERT', 'not in the drawing plane', layer, here[0], here[1]);
      return;
    }
    if (!block) {
      sink.ignored('INSERT', `refers to a block "${name}" that the file does not define`, layer, here[0], here[1]);
      return;
    }
    if (stack.includes(name)) {
      throw new DxfImportError('block-problem', `Block "${name}" contains a reference to itself (through ${[...stack, name].join(' → ')}). Fix the block in your CAD program and upload again.`);
    }
    if (stack.length >= maxDepth) {
      throw new DxfImportError('block-problem', `Blocks are nested more than ${maxDepth} deep at block "${name}", the most Panelpoint takes; explode some of them in your CAD program and upload again${orRaise}.`);
    }
    const sx = num(e.xScale, 1);
    const sy = num(e.yScale, 1);
    const rot = num(e.rotation, 0);
    const cols = Math.max(1, Math.min(10_000, Math.floor(num(e.columnCount, 1)) || 1));
    const rows = Math.max(1, Math.min(10_000, Math.floor(num(e.rowCount, 1)) || 1));
    if (cols * rows > 100_000) {
      throw new DxfImportError('block-problem', `The INSERT of block "${name}" (handle ${handleOf(e)}) repeats it ${cols * rows} times. Explode the array in your CAD program and upload again.`);
    }
    const dx = num(e.columnSpacing, 0);
    const dy = num(e.rowSpacing, 0);
    const base = block.position ?? { x: 0, y: 0 };
    stack.push(name);
    for (let r = 0; r < rows; r++) {
      for (let c = 0; c < cols; c++) {
        const local = affineOfInsert(
          { x: num(pos.x, NaN), y: num(pos.y, NaN) },
          { x: num(base.x, 0), y: num(base.y, 0) },
          sx,
          sy,
          rot,
          c * dx,
          r * dy,
        );
        walk(block.entities, affineCompose(m, local), layer);
      }
    }
    stack.pop();
  };

  const doText = (e: AnyEntity, m: Affine, layer: string) => {
    const isM = e.type === 'MTEXT';
    const rawText = typeof e.text === 'string' ? e.text : '';
    const text = isM ? mtextPlain(rawText) : rawText.trim();
    let anchor: { x: number; y: number } | undefined;
    let h: number;
    let dxRel = 0.5; // centre offset along the text direction, in text widths
    let dyRel = 0.5; // centre offset across, in text heights
    let angle: number;
    if (isM) {
      anchor = e.position;
      h = num(e.height, 0);
      const ap = Math.min(9, Math.max(1, Math.floor(num(e.attachmentPoint, 1))));
      dxRel = [0.5, 0, -0.5][(ap - 1) % 3];
      dyRel = [-0.5, 0, 0.5][Math.floor((ap - 1) / 3)];
      angle = e.directionVector ? Math.atan2(num(e.directionVector.y, 0), num(e.directionVector.x, 1)) : num(e.rotation, 0);
    } else {
      const h72 = num(e.halign, 0);
      const v73 = num(e.valign, 0);
      anchor = (h72 !== 0 || v73 !== 0) && e.endPoint ? e.endPoint : e.startPoint;
      h = num(e.textHeight, 0);
      dxRel = h72 === 1 || h72 === 4 ? 0 : h72 === 2 ? -0.5 : 0.5;
      dyRel = h72 === 4 || v73 === 2 ? 0 : v73 === 3 ? -0.5 : 0.5;
      angle = (num(e.rotation, 0) * Math.PI) / 180;
    }
    const ax = num(anchor?.x, NaN);
    const ay = num(anchor?.y, NaN);
    const w = 0.6 * h * Math.max(1, text.length);
    const ox = dxRel * w;
    const oy = dyRel * h;
    const cx = ax + Math.cos(angle) * ox - Math.sin(angle) * oy;
    const cy = ay + Math.sin(angle) * ox + Math.cos(angle) * oy;
    const [x, y] = apply(m, cx, cy);
    const scale = Math.sqrt(Math.abs(m[0] * m[3] - m[1] * m[2]));
    sink.entity(e.type, layer, Number.isFinite(x) ? x : null, Number.isFinite(y) ? y : null);
    if (!Number.isFinite(x) || !Number.isFinite(y) || text === '') {
      sink.ignored(e.type, text === '' ? 'empty text' : 'no position', layer, null, null);
      return;
    }
    sink.text({ text, x, y, height: h * scale, layer, type: isM ? 'MTEXT' : 'TEXT' });
  };

  walk(dxf.entities, root, null);
}

/** True when a POLYLINE's vertices carry z values that differ (3D vertices without the 3D flag). */
function hasVertexZ(e: AnyEntity): boolean {
  const verts = e.vertices as { z?: number }[] | undefined;
  if (!Array.isArray(verts) || verts.length < 2) return false;
  const z0 = num(verts[0]?.z, 0);
  for (const v of verts) if (num(v?.z, 0) !== z0) return true;
  return false;
}

function representativePoint(e: AnyEntity): { x: number; y: number } | null {
  const cand = e.center ?? e.position ?? e.startPoint ?? e.anchorPoint ?? e.middleOfText ?? e.vertices?.[0] ?? e.controlPoints?.[0] ?? e.fitPoints?.[0];
  if (cand && typeof cand.x === 'number' && typeof cand.y === 'number' && Number.isFinite(cand.x) && Number.isFinite(cand.y)) {
    return { x: cand.x, y: cand.y };
  }
  return null;
}

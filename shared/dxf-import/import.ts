import type { IDxf } from 'dxf-parser';
import type { Joint, MemberGroup } from '@shared/model/truss';
import { scientificFormat } from '../units/format';
import { DxfImportError } from './errors';
import { describeEntity, explodeDrawing, type DxfExplodeLimits, type ExplodedText } from './explode';
import { memberGroupCodes } from './groups';
import { healSegments, quickMedian, type HealResult } from './heal';
import { mechanismCheck } from './mechanism';
import { dxfOf, LayerTally } from './layers';
import { sortIndicesByInt } from './sort';
import { assignTags, jointTagsInOrder, memberTagOf, readingOrder } from './tags';
import {
  DXF_REPORT_MAX_LOCATIONS,
  dxfImportOptionsSchema,
  type DxfImportOptions,
  type DxfGeometry,
  type DxfGeometryResult,
  type DxfImportResult,
  type DxfLengthUnit,
  type DxfMember,
  type DxfParsed,
  type DxfPoint,
  type DxfReportEntry,
} from './types';

/**
 * $INSUNITS codes → [name, metres per unit, our symbol]. Codes from the DXF Reference
 * (Autodesk), INSUNITS; factors are the exact definitions of the units (international inch
 * 25.4 mm, foot 0.3048 m, yard 0.9144 m, mile 1609.344 m, US survey foot 1200/3937 m; the
 * astronomical unit 149 597 870 700 m, IAU 2012; light year and parsec from their IAU values).
 */
const INSUNITS: Record<number, [string, number, DxfLengthUnit | null]> = {
  1: ['inches', 0.0254, 'in'],
  2: ['feet', 0.3048, 'ft'],
  3: ['miles', 1609.344, null],
  4: ['millimetres', 0.001, 'mm'],
  5: ['centimetres', 0.01, 'cm'],
  6: ['metres', 1, 'm'],
  7: ['kilometres', 1000, null],
  8: ['microinches', 0.0254e-6, null],
  9: ['mils', 0.0254e-3, null],
  10: ['yards', 0.9144, null],
  11: ['ångströms', 1e-10, null],
  12: ['nanometres', 1e-9, null],
  13: ['micrometres', 1e-6, null],
  14: ['decimetres', 0.1, null],
  15: ['decametres', 10, null],
  16: ['hectometres', 100, null],
  17: ['gigametres', 1e9, null],
  18: ['astronomical units', 149_597_870_700, null],
  19: ['light years', 9_460_730_472_580_800, null],
  20: ['parsecs', 3.085_677_581_491_367e16, null],
  21: ['US survey feet', 1200 / 3937, null],
};

const UNIT_OF_SYMBOL: Record<DxfLengthUnit, [string, number]> = {
  m: ['metres', 1],
  mm: ['millimetres', 0.001],
  cm: ['centimetres', 0.01],
  in: ['inches', 0.0254],
  ft: ['feet', 0.3048],
};

/** Farthest a point may lie from the origin, m: beyond any site grid (UTM northings stay below 10 000 km). */
export const DXF_MAX_COORDINATE_M = 1e7;

/**
 * The units a drawing declares in its header ($INSUNITS), or null when it is unitless
 * (0 or absent, as in every R12 file) or uses a code we do not know.
 */
export function dxfUnitOf(parsed: DxfParsed | IDxf): { insunits: number; name: string; unit: DxfLengthUnit | null; metresPerUnit: number } | null {
  const { dxf } = dxfOf(parsed);
  const raw = dxf.header?.['$INSUNITS'];
  const code = typeof raw === 'number' && Number.isInteger(raw) ? raw : 0;
  const u = INSUNITS[code];
  if (!u) return null;
  return { insunits: code, name: u[0], unit: u[2], metresPerUnit: u[1] };
}

/** "1 mm", "2.5 mm", "0.12 m", "3 m": lengths in messages. */
function formatLength(m: number): string {
  if (m < 1) return `${trim(m * 1000)} mm`;
  return `${trim(m)} m`;
}

function trim(v: number): string {
  return String(Number(v.toPrecision(3)));
}

function formatPoint(x: number, y: number): string {
  return `(${x.toFixed(2)}, ${y.toFixed(2)}) m`;
}

function plural(n: number, one: string, many = `${one}s`): string {
  return `${n} ${n === 1 ? one : many}`;
}

const ENTITY_WORDS: Record<string, [string, string]> = {
  ARC: ['arc', 'arcs'],
  CIRCLE: ['circle', 'circles'],
  ELLIPSE: ['ellipse', 'ellipses'],
  SPLINE: ['spline', 'splines'],
  TEXT: ['text', 'texts'],
  MTEXT: ['multiline text', 'multiline texts'],
  DIMENSION: ['dimension', 'dimensions'],
  HATCH: ['hatch', 'hatches'],
  POINT: ['point', 'points'],
  SOLID: ['solid fill', 'solid fills'],
  '3DFACE': ['3D face', '3D faces'],
  ATTDEF: ['attribute definition', 'attribute definitions'],
  INSERT: ['block reference', 'block references'],
  POLYLINE: ['polyline', 'polylines'],
  LWPOLYLINE: ['polyline', 'polylines'],
  LINE: ['line', 'lines'],
};

function entityWords(type: string, n: number): string {
  const w = ENTITY_WORDS[type];
  if (w) return `${n} ${n === 1 ? w[0] : w[1]}`;
  return `${n} ${type} ${n === 1 ? 'entity' : 'entities'}`;
}

/**
 * Default tolerance: 1/10 000 of the drawing's diagonal, but at most 1/1 000 of the typical
 * (median) segment length, rounded down to 1, 2 or 5 × 10ⁿ m (common practice, no source).
 */
function defaultTolerance(diagonal: number): number {
  const raw = diagonal / 10_000;
  const p = Math.pow(10, Math.floor(Math.log10(raw)));
  const m = raw / p;
  const nice = m >= 5 ? 5 : m >= 2 ? 2 : 1;
  return nice * p;
}

/** Segments as x1, y1, x2, y2 on a doubling typed array, with a layer index and arc flag each. */
class Growable {
  data: Float64Array;
  layer: Int32Array;
  bulged: Uint8Array;
  length = 0;
  /** `expected` segments fit without growing: one allocation each instead of a doubling series. */
  constructor(expected: number) {
    const n = Math.max(1024, expected);
    this.data = new Float64Array(4 * n);
    this.layer = new Int32Array(n);
    this.bulged = new Uint8Array(n);
  }
  push4(a: number, b: number, c: number, d: number): void {
    if (this.length + 4 > this.data.length) {
      const bigger = new Float64Array(this.data.length * 2);
      bigger.set(this.data);
      this.data = bigger;
    }
    const o = this.length;
    if (o / 4 >= this.layer.length) {
      const layer = new Int32Array(this.layer.length * 2);
      layer.set(this.layer);
      this.layer = layer;
      const bulged = new Uint8Array(this.bulged.length * 2);
      bulged.set(this.bulged);
      this.bulged = bulged;
    }
    this.data[o] = a;
    this.data[o + 1] = b;
    this.data[o + 2] = c;
    this.data[o + 3] = d;
    this.length += 4;
  }
  /** Drops, in place and in order, the segments whose layer index is not marked in `keep`. */
  keepLayers(keep: Uint8Array): void {
    const n = this.length / 4;
    let m = 0;
    for (let i = 0; i < n; i++) {
      if (!keep[this.layer[i]]) continue;
      for (let c = 0; c < 4; c++) this.data[4 * m + c] = this.data[4 * i + c];
      this.layer[m] = this.layer[i];
      this.bulged[m] = this.bulged[i];
      m++;
    }
    this.length = 4 * m;
  }
}

function pushLimited<T>(list: T[], ...items: T[]): void {
  for (const it of items) if (list.length < DXF_REPORT_MAX_LOCATIONS) list.push(it);
}

/**
 * The healed geometry in id order, as columns: joints in reading order (with the tags texts
 * gave them), members ordered by their joints. In a function of its own so that it is optimised as a whole (V8).
 */
function geometryOf(h: HealResult, texts: ExplodedText[], tol: number, layerNames: string[], segLayer: Int32Array) {
  const J = h.joints.length / 2;
  const M = h.members.length / 2;
  const order = readingOrder(h.joints, tol);
  const tagResult = assignTags(h.joints, texts, tol);
  const rank = new Int32Array(J);
  for (let r = 0; r < J; r++) rank[order[r]] = r;
  const jointXY = new Float64Array(2 * J);
  for (let r = 0; r < J; r++) {
    const j = order[r];
    jointXY[2 * r] = h.joints[2 * j];
    jointXY[2 * r + 1] = h.joints[2 * j + 1];
  }
  const textTags = new Map<number, string>();
  for (const [j, tag] of tagResult.textTags) textTags.set(rank[j], tag);
  // members by their earlier joint, then their later one (stable counting sorts, last key first)
  const early = new Int32Array(M);
  const late = new Int32Array(M);
  for (let i = 0; i < M; i++) {
    const ra = rank[h.members[2 * i]];
    const rb = rank[h.members[2 * i + 1]];
    early[i] = ra < rb ? ra : rb;
    late[i] = ra < rb ? rb : ra;
  }
  const mOrder = new Int32Array(M);
  for (let i = 0; i < M; i++) mOrder[i] = i;
  sortIndicesByInt(mOrder, late, J);
  sortIndicesByInt(mOrder, early, J);
  const mRank = new Int32Array(M);
  const memberEnds = new Int32Array(2 * M);
  const memberLayer = new Int32Array(M);
  for (let r = 0; r < M; r++) {
    const i = mOrder[r];
    mRank[i] = r;
    memberEnds[2 * r] = early[i];
    memberEnds[2 * r + 1] = late[i];
    memberLayer[r] = segLayer[h.memberSource[i]];
  }
  const geometry: DxfGeometry = { jointXY, textTags, memberEnds, memberLayer, layerNames };
  return { tagResult, rank, mRank, geometry };
}

/**
 * The truss model's joints and members of an imported geometry: one object each, ids 'j1'…
 * and 'm1'…, member tags from their joints' tags.
 */
export function dxfModelOf(geometry: DxfGeometry): { joints: Joint[]; members: DxfMember[] } {
  const { jointXY, memberEnds, memberLayer, layerNames } = geometry;
  const J = jointXY.length / 2;
  const jointTags = jointTagsInOrder(J, geometry.textTags);
  const M = memberLayer.length;
  // arrays filled by push: new Array(n) past 100 000 items is a slow dictionary-mode array (V8)
  const jointIds: string[] = [];
  for (let r = 0; r < J; r++) jointIds.push(`j${r + 1}`);
  const joints: Joint[] = [];
  for (let r = 0; r < J; r++) joints.push({ id: jointIds[r], tag: jointTags[r], x: jointXY[2 * r], y: jointXY[2 * r + 1] });
  const members: DxfMember[] = [];
  for (let r = 0; r < M; r++) {
    const a = memberEnds[2 * r];
    const b = memberEnds[2 * r + 1];
    members.push({ id: `m${r + 1}`, tag: memberTagOf(jointTags[a], jointTags[b]), from: jointIds[a], to: jointIds[b], layer: layerNames[memberLayer[r]] });
  }
  return { joints, members };
}

/**
 * Imports a parsed drawing as truss geometry: joints (m) and members, healed, tagged, and a
 * report of every change and every entity left out. The geometry comes as typed-array
 * columns ({@link DxfGeometry}); {@link dxfImport} gives it as the model's objects.
 *
 * Reads LINE, LWPOLYLINE and 2-D POLYLINE (open or closed; each span a member; arc spans
 * taken as straight members and reported 'ignored-bulge') on the chosen layers, exploding
 * INSERTs of blocks (nested, scale, mirroring, rotation, base point, arrays). Converts the
 * drawing's units ($INSUNITS, or `options.units`) to metres, then heals with tolerance
 * `options.tolerance` (m; default 1/10 000 of the drawing's diagonal, rounded to 1-2-5):
 * merges endpoints, drops zero-length segments, merges duplicates and collinear overlaps,
 * splits members at joints on their interior; reports crossings without a joint, dangling
 * members and separate pieces without changing them. Joint tags come from TEXT/MTEXT near a
 * joint, otherwise A, B, … in reading order; member tags join their joints' tags ("BC").
 *
 * @throws DxfImportError 'bad-option' (options fail the schema), 'units-required' (unitless
 *   drawing, no units chosen), 'unknown-layer', 'no-lines' (nothing straight on the chosen
 *   layers), 'bad-coordinate' (NaN / missing), 'coordinate-too-large' (beyond 10 000 km from the
 *   origin), 'tolerance-too-large' (tolerance over half the typical member length),
 *   'block-problem' (self-referencing or too deeply nested blocks).
 */
export function dxfImportGeometry(parsed: DxfParsed | IDxf, options: DxfImportOptions = {}, limits: Partial<DxfExplodeLimits> = {}): DxfGeometryResult {
  const opt = dxfImportOptionsSchema.safeParse(options ?? {});
  if (!opt.success) {
    const first = opt.error.issues[0];
    throw new DxfImportError('bad-option', `The import option "${first?.path.join('.') || 'options'}" is not valid (${first?.message ?? 'invalid'}). Use layers as a list of layer names, units as m, mm, cm, in or ft, and a tolerance in metres greater than 0.`);
  }
  const o = opt.data;
  const { dxf, unread } = dxfOf(parsed);
  if (!dxf || typeof dxf !== 'object') {
    throw new DxfImportError('unreadable', 'There is no parsed drawing to import. Parse the file with dxfParse first.');
  }
  const report: DxfReportEntry[] = [];
  const entry = (e: Omit<DxfReportEntry, 'points' | 'joints' | 'members'> & Partial<Pick<DxfReportEntry, 'points' | 'joints' | 'members'>>): DxfReportEntry => {
    const full: DxfReportEntry = { points: [], joints: [], members: [], ...e };
    report.push(full);
    return full;
  };

  // ---- units
  const declared = dxfUnitOf(dxf);
  const insunits = declared?.insunits ?? (typeof dxf.header?.['$INSUNITS'] === 'number' ? (dxf.header['$INSUNITS'] as number) : 0);
  let units: DxfImportResult['units'] | null;
  if (o.units) {
    const [name, f] = UNIT_OF_SYMBOL[o.units];
    units = { name, unit: o.units, metresPerUnit: f, insunits, source: 'option' };
    if (declared && declared.metresPerUnit !== f) {
      entry({ kind: 'units', severity: 'warning', count: 1, message: `read the drawing in ${name} as chosen, although it says it is drawn in ${declared.name}` });
    } else {
      entry({ kind: 'units', severity: 'info', count: 1, message: `read the drawing in ${name} as chosen and converted to metres` });
    }
  } else if (declared) {
    units = { name: declared.name, unit: declared.unit, metresPerUnit: declared.metresPerUnit, insunits, source: 'drawing' };
    entry({ kind: 'units', severity: 'info', count: 1, message: `read the drawing in ${declared.name}, as its header says ($INSUNITS = ${insunits}), and converted to metres` });
  } else {
    // Asked only once the drawing is known to hold lines (below): a file with nothing to import
    // is told so first, not asked for its units. Read in drawing units meanwhile.
    units = null;
  }
  const k = units?.metresPerUnit ?? 1;

  // ---- explode, in metres, every layer at once: the layers are listed in the same walk
  const tally = new LayerTally(dxf);
  const segs = new Growable(Array.isArray(dxf.entities) ? dxf.entities.length : 0);
  const layerIndex = new Map<string, number>();
  const layerNames: string[] = [];
  const texts: ExplodedText[] = [];
  const ignored = new Map<string, { type: string; reason: string; count: number; layers: Set<string>; points: DxfPoint[] }>();
  const ignore = (type: string, reason: string, layer: string, x: number | null, y: number | null) => {
    const key = `${type}\u0000${reason}`;
    let g = ignored.get(key);
    if (!g) {
      g = { type, reason, count: 0, layers: new Set(), points: [] };
      ignored.set(key, g);
    }
    g.count++;
    g.layers.add(layer);
    if (x !== null && y !== null && Number.isFinite(x) && Number.isFinite(y)) pushLimited(g.points, { x, y });
  };
  // the first segment of each layer with a coordinate that is not a number or too far out:
  // an error only if that layer is chosen, which is known after the walk
  const badOfLayer = new Map<number, { entity: object; layer: string; v: number[]; seq: number }>();
  // the first polyline of each layer that is not flat: refused only if that layer is chosen
  const notFlatOfLayer = new Map<string, { entity: object; zMin: number; zMax: number }>();
  let seq = 0;
  // segments come in long runs on one layer: remember the last layer's index
  let lastLayer: string | null = null;
  let lastIndex = -1;
  explodeDrawing(dxf, [k, 0, 0, k, 0, 0], {
    segment(layer, x1, y1, x2, y2, entity, bulged) {
      tally.segment(layer);
      seq++;
      if (layer !== lastLayer) {
        lastLayer = layer;
        let li = layerIndex.get(layer);
        if (li === undefined) {
          li = layerNames.length;
          layerNames.push(layer);
          layerIndex.set(layer, li);
        }
        lastIndex = li;
      }
      if (
        !(Math.abs(x1) <= DXF_MAX_COORDINATE_M && Math.abs(y1) <= DXF_MAX_COORDINATE_M && Math.abs(x2) <= DXF_MAX_COORDINATE_M && Math.abs(y2) <= DXF_MAX_COORDINATE_M)
      ) {
        if (!badOfLayer.has(lastIndex)) badOfLayer.set(lastIndex, { entity, layer, v: [x1, y1, x2, y2], seq });
        return;
      }
      const at = segs.length / 4;
      segs.push4(x1, y1, x2, y2);
      segs.layer[at] = lastIndex;
      segs.bulged[at] = bulged ? 1 : 0;
    },
    text(t) {
      if (Math.abs(t.x) <= DXF_MAX_COORDINATE_M && Math.abs(t.y) <= DXF_MAX_COORDINATE_M && Number.isFinite(t.height)) texts.push(t);
      else ignore(t.type, 'no usable position', t.layer, null, null);
    },
    entity(type, layer) {
      tally.entity(type, layer);
    },
    ignored(type, reason, layer, x, y) {
      ignore(type, reason, layer, x, y);
    },
    notFlat(layer, entity, zMin, zMax, spans) {
      for (let i = 0; i < spans; i++) tally.segment(layer);
      if (!notFlatOfLayer.has(layer)) notFlatOfLayer.set(layer, { entity, zMin, zMax });
    },
  }, limits);
  for (const [type, perLayer] of Object.entries(unread)) {
    for (const [layer, n] of Object.entries(perLayer)) {
      for (let i = 0; i < n; i++) ignore(type, 'not read by the DXF reader', layer, null, null);
    }
  }
  const layerInfo = tally.finish(unread);

  // ---- layers
  const lineLayers = layerInfo.filter((l) => l.holdsLines).map((l) => l.name);
  let chosen: string[];
  if (o.layers) {
    const known = new Set(layerInfo.map((l) => l.name));
    const missing = o.layers.filter((l) => !known.has(l));
    if (missing.length > 0) {
      throw new DxfImportError('unknown-layer', `The drawing has no layer ${missing.map((m) => `"${m}"`).join(', ')}. Its layers are ${layerInfo.map((l) => `"${l.name}"`).join(', ') || 'none'}; choose from those.`);
    }
    chosen = [...new Set(o.layers)];
  } else {
    chosen = lineLayers;
  }
  const chosenSet = new Set(chosen);
  const segOnChosen = layerInfo.filter((l) => chosenSet.has(l.name)).reduce((s, l) => s + l.segments, 0);
  if (segOnChosen === 0) {
    if (lineLayers.length === 0) {
      const found = layerInfo.flatMap((l) => Object.entries(l.counts)).reduce<Record<string, number>>((acc, [t, n]) => {
        acc[t] = (acc[t] ?? 0) + n;
        return acc;
      }, {});
      const what = Object.entries(found).map(([t, n]) => entityWords(t, n)).join(', ');
      throw new DxfImportError('no-lines', `The drawing holds no lines or polylines on any layer${what ? ` (it holds ${what})` : ''}. Draw the truss members as lines or polylines and upload again.`);
    }
    throw new DxfImportError('no-lines', `There are no lines or polylines on the chosen layer${chosen.length === 1 ? '' : 's'} ${chosen.map((c) => `"${c}"`).join(', ')}. Layers holding lines: ${lineLayers.map((c) => `"${c}"`).join(', ')}; choose from those.`);
  }
  const notFlat = chosen.map((l) => [l, notFlatOfLayer.get(l)] as const).find(([, f]) => f !== undefined);
  if (notFlat) {
    const [layer, f] = notFlat;
    const span = f!.zMax - f!.zMin;
    const zIn = (v: number) => (units ? formatLength(v) : `${trim(v)} drawing units`);
    throw new DxfImportError(
      'not-planar',
      `The 3D ${describeEntity(f!.entity, layer)} does not lie flat: its vertices' z runs from ${zIn(f!.zMin)} to ${zIn(f!.zMax)} (${zIn(span)} apart), so it is not in one plane parallel to XY. Draw the truss flat (all z equal) in your CAD program, or leave layer "${layer}" out with the layers option, and upload again.`,
    );
  }
  if (!units) {
    throw new DxfImportError(
      'units-required',
      insunits === 0
        ? 'The drawing does not say what units it is drawn in ($INSUNITS is 0 or missing). Choose the units (m, mm, cm, in or ft) and import again.'
        : `The drawing says its units are code ${insunits} ($INSUNITS), which Panelpoint does not know. Choose the units (m, mm, cm, in or ft) and import again.`,
    );
  }
  const chosenIndex = new Uint8Array(layerNames.length);
  for (let li = 0; li < layerNames.length; li++) chosenIndex[li] = chosenSet.has(layerNames[li]) ? 1 : 0;
  // the first such segment met in the drawing, of those on chosen layers
  const firstBad = [...badOfLayer.entries()].filter(([li]) => chosenIndex[li]).sort((p, q) => p[1].seq - q[1].seq)[0];
  if (firstBad) {
    const b = firstBad[1];
    if (b.v.some((c) => !Number.isFinite(c))) {
      throw new DxfImportError('bad-coordinate', `The ${describeEntity(b.entity, b.layer)} has a coordinate that is not a number. Fix or delete it in your CAD program and upload again.`);
    }
    const far = Math.max(...b.v.map(Math.abs));
    throw new DxfImportError('coordinate-too-large', `The ${describeEntity(b.entity, b.layer)} lies ${scientificFormat(far, 3)} m from the origin, more than the 10 000 km Panelpoint accepts. Check the drawing's units, or move the truss near the origin, and import again.`);
  }
  if (chosen.length < lineLayers.length) segs.keepLayers(chosenIndex);
  const n = segs.length / 4;
  const seg = segs.data.subarray(0, segs.length);
  const segLayer = segs.layer;
  const segBulged = segs.bulged;

  // ---- extent and tolerance
  let minX = Infinity;
  let minY = Infinity;
  let maxX = -Infinity;
  let maxY = -Infinity;
  for (let i = 0; i < seg.length; i += 2) {
    const x = seg[i];
    const y = seg[i + 1];
    if (x < minX) minX = x;
    if (x > maxX) maxX = x;
    if (y < minY) minY = y;
    if (y > maxY) maxY = y;
  }
  const diagonal = Math.hypot(maxX - minX, maxY - minY);
  if (!(diagonal > 0)) {
    throw new DxfImportError('no-lines', `Every line on the chosen layers has zero length (they all sit at one point). Draw the truss members as lines and upload again.`);
  }
  const tolSource: 'default' | 'option' = o.tolerance !== undefined ? 'option' : 'default';
  const lens = new Float64Array(n);
  let nLens = 0;
  for (let i = 0; i < n; i++) {
    const dx = seg[4 * i + 2] - seg[4 * i];
    const dy = seg[4 * i + 3] - seg[4 * i + 1];
    const L = Math.sqrt(dx * dx + dy * dy);
    if (L > 0) lens[nLens++] = L;
  }
  if (nLens === 0) {
    // Points spread over the drawing, but every line starts where it ends.
    throw new DxfImportError('no-lines', `Every line on the chosen layers has zero length (each starts where it ends), so there is no member to import. Draw the truss members as lines between their joints and upload again.`);
  }
  // the element sorting would put at ⌊n/2⌋, found without sorting
  const typical = quickMedian(lens.subarray(0, nLens));
  const tol = o.tolerance ?? defaultTolerance(Math.min(diagonal, 10 * typical));
  {
    if (tolSource === 'option' && tol > typical / 2) {
      throw new DxfImportError('tolerance-too-large', `The tolerance of ${formatLength(tol)} is more than half the typical member length (${formatLength(typical)}), so it would join joints that should stay apart. Choose a smaller tolerance and import again.`);
    }
  }
  entry({
    kind: 'tolerance',
    severity: 'info',
    count: 1,
    message:
      tolSource === 'default'
        ? diagonal <= 10 * typical
          ? `joined endpoints closer than ${formatLength(tol)} (the default: 1/10 000 of the drawing's ${formatLength(diagonal)} diagonal)`
          : `joined endpoints closer than ${formatLength(tol)} (the default: 1/1 000 of the typical ${formatLength(typical)} segment)`
        : `joined endpoints closer than ${formatLength(tol)}, as chosen`,
  });

  // ---- heal
  const h = healSegments(seg, n, tol);
  const J = h.joints.length / 2;
  const M = h.members.length / 2;

  // ---- tags, order, ids
  const { tagResult, rank, mRank, geometry } = geometryOf(h, texts, tol, layerNames, segLayer);

  // ---- report
  const layerUsed = new Uint8Array(layerNames.length);
  for (let i = 0; i < M; i++) layerUsed[segLayer[h.memberSource[i]]] = 1;
  const usedLayers = layerNames.filter((_, li) => layerUsed[li] === 1).sort();
  const segsOfLayer = new Int32Array(layerNames.length);
  for (let i = 0; i < n; i++) segsOfLayer[segLayer[i]]++;
  const perLayer = new Map<string, number>(layerNames.map((l, li) => [l, segsOfLayer[li]]));
  const leftOut = lineLayers.filter((l) => !chosenSet.has(l));
  entry({
    kind: 'layers',
    severity: 'info',
    count: chosen.length,
    message:
      `took members from ${chosen.length === 1 ? 'layer' : 'layers'} ${chosen.map((l) => `${l} (${plural(perLayer.get(l) ?? 0, 'segment')})`).join(', ')}` +
      (leftOut.length ? `; left out ${leftOut.length === 1 ? 'layer' : 'layers'} holding lines: ${leftOut.join(', ')}` : ''),
    layers: chosen,
  });
  const pts = (flat: number[]): DxfPoint[] => {
    const out: DxfPoint[] = [];
    for (let i = 0; i + 1 < flat.length && out.length < DXF_REPORT_MAX_LOCATIONS; i += 2) out.push({ x: flat[i], y: flat[i + 1] });
    return out;
  };
  // ids of the joints or members listed, each once, in id order, at most the report's limit
  const idsBy = (list: ArrayLike<number>, rankOf: Int32Array, prefix: string): string[] => {
    const ranks = new Int32Array(list.length);
    for (let p = 0; p < list.length; p++) ranks[p] = rankOf[list[p]];
    ranks.sort();
    const out: string[] = [];
    for (let p = 0; p < ranks.length && out.length < DXF_REPORT_MAX_LOCATIONS; p++) {
      if (p === 0 || ranks[p] !== ranks[p - 1]) out.push(`${prefix}${ranks[p] + 1}`);
    }
    return out;
  };
  const jointIdsOf = (list: ArrayLike<number>) => idsBy(list, rank, 'j');
  const memberIdsOf = (list: ArrayLike<number>) => idsBy(list, mRank, 'm');
  if (h.merged.count > 0) {
    entry({
      kind: 'merged-endpoints',
      severity: 'change',
      count: h.merged.count,
      message: `merged ${plural(h.merged.count, 'endpoint')} closer than ${formatLength(tol)} into ${plural(h.merged.joints.length, 'joint')}`,
      joints: jointIdsOf(h.merged.joints),
      points: h.merged.joints.slice(0, DXF_REPORT_MAX_LOCATIONS).map((j) => ({ x: h.joints[2 * j], y: h.joints[2 * j + 1] })),
    });
  }
  if (h.zeroLength.count > 0) {
    entry({
      kind: 'dropped-zero-length',
      severity: 'change',
      count: h.zeroLength.count,
      message: `dropped ${plural(h.zeroLength.count, 'segment')} of zero length (shorter than ${formatLength(tol)})`,
      points: pts(h.zeroLength.points),
    });
  }
  if (h.duplicates.count > 0) {
    entry({
      kind: 'merged-duplicate',
      severity: 'change',
      count: h.duplicates.count,
      message: `merged ${plural(h.duplicates.count, 'duplicate member')} drawn on top of another`,
      members: memberIdsOf(h.duplicates.members),
      points: pts(h.duplicates.points),
    });
  }
  if (h.splits.members > 0) {
    entry({
      kind: 'split-member',
      severity: 'change',
      count: h.splits.members,
      message: `split ${plural(h.splits.members, 'member')} at ${plural(h.splits.cuts, 'joint')} lying on ${h.splits.members === 1 ? 'it' : 'them'}`,
      joints: jointIdsOf(h.splits.joints),
      members: memberIdsOf(h.splits.pieces),
      points: Array.from(h.splits.joints.subarray(0, DXF_REPORT_MAX_LOCATIONS), (j) => ({ x: h.joints[2 * j], y: h.joints[2 * j + 1] })),
    });
  }
  if (h.overlaps.count > 0) {
    entry({
      kind: 'merged-overlap',
      severity: 'change',
      count: h.overlaps.count,
      message: `merged ${plural(h.overlaps.count, 'overlapping collinear piece')} into the member ${h.overlaps.count === 1 ? 'it overlapped' : 'they overlapped'}`,
      members: memberIdsOf(h.overlaps.members),
      points: pts(h.overlaps.points),
    });
  }
  if (h.crossings.length > 0) {
    const c0 = h.crossings[0];
    const nC = h.crossings.length;
    entry({
      kind: 'crossing',
      severity: 'warning',
      count: nC,
      message:
        nC === 1
          ? `2 members cross without a joint at ${formatPoint(c0.x, c0.y)}; they were left apart`
          : `${nC} pairs of members cross without a joint, the first at ${formatPoint(c0.x, c0.y)}; they were left apart`,
      members: memberIdsOf(h.crossings.flatMap((c) => [c.a, c.b])),
      points: h.crossings.slice(0, DXF_REPORT_MAX_LOCATIONS).map((c) => ({ x: c.x, y: c.y })),
    });
  }
  if (h.dangling.length > 0) {
    const nD = new Set(h.dangling.map((d) => d.member)).size;
    entry({
      kind: 'dangling-member',
      severity: 'warning',
      count: nD,
      message: `${plural(nD, 'member has', 'members have')} an end joined to nothing else`,
      members: memberIdsOf(h.dangling.map((d) => d.member)),
      joints: jointIdsOf(h.dangling.map((d) => d.joint)),
      points: h.dangling.slice(0, DXF_REPORT_MAX_LOCATIONS).map((d) => ({ x: h.joints[2 * d.joint], y: h.joints[2 * d.joint + 1] })),
    });
  }
  if (h.pieces.length > 0) {
    const nP = h.pieces.length;
    entry({
      kind: 'isolated-piece',
      severity: 'warning',
      count: nP,
      message: `${plural(nP, 'piece is', 'pieces are')} not connected to the main truss (${plural(h.pieces.reduce((s, p) => s + p.length, 0), 'member')})`,
      members: memberIdsOf(h.pieces.flat()),
      points: h.pieces.slice(0, DXF_REPORT_MAX_LOCATIONS).map((p) => {
        let sx = 0;
        let sy = 0;
        for (const i of p) {
          sx += h.joints[2 * h.members[2 * i]] + h.joints[2 * h.members[2 * i + 1]];
          sy += h.joints[2 * h.members[2 * i] + 1] + h.joints[2 * h.members[2 * i + 1] + 1];
        }
        return { x: sx / (2 * p.length), y: sy / (2 * p.length) };
      }),
    });
  }
  const bulged: DxfPoint[] = [];
  let nBulged = 0;
  for (let i = 0; i < n; i++) {
    if (!segBulged[i]) continue;
    nBulged++;
    if (bulged.length < DXF_REPORT_MAX_LOCATIONS) bulged.push({ x: (seg[4 * i] + seg[4 * i + 2]) / 2, y: (seg[4 * i + 1] + seg[4 * i + 3]) / 2 });
  }
  if (nBulged > 0) {
    // the members the arc spans became (a member keeps the segment it came from)
    const bulgedMembers: number[] = [];
    for (let i = 0; i < M; i++) if (segBulged[h.memberSource[i]]) bulgedMembers.push(i);
    entry({
      members: memberIdsOf(bulgedMembers),
      kind: 'ignored-bulge',
      severity: 'warning',
      count: nBulged,
      message: `took ${plural(nBulged, 'arc segment')} of polylines as straight ${nBulged === 1 ? 'member' : 'members'} between ${nBulged === 1 ? 'its' : 'their'} ends (bulge ignored)`,
      points: bulged,
    });
  }
  const tagged = tagResult.fromText.length;
  entry({
    kind: 'joint-tags',
    severity: 'info',
    count: J,
    message:
      tagged === 0
        ? `named ${plural(J, 'joint')} A, B, C, … in reading order (top to bottom, left to right)`
        : `took ${plural(tagged, 'joint label')} from texts near the joints${J - tagged > 0 ? `; named the other ${plural(J - tagged, 'joint')} in reading order` : ''}`,
    joints: jointIdsOf(tagResult.fromText),
  });
  for (const u of tagResult.unused) ignore(u.text.type, u.reason, u.text.layer, u.text.x, u.text.y);
  const ignoredList = [...ignored.values()].sort((a, b) => (a.type < b.type ? -1 : a.type > b.type ? 1 : a.reason < b.reason ? -1 : 1));
  for (const g of ignoredList) {
    const layers = [...g.layers].sort();
    entry({
      kind: 'ignored-entity',
      severity: 'info',
      count: g.count,
      message: `ignored ${entityWords(g.type, g.count)} (${g.reason}) on ${layers.length === 1 ? 'layer' : 'layers'} ${layers.join(', ')}`,
      entityType: g.type,
      layers,
      points: g.points,
    });
  }

  return {
    geometry,
    units,
    tolerance: { value: tol, source: tolSource },
    extent: { minX, minY, maxX, maxY },
    layers: usedLayers,
    report,
  };
}

/**
 * {@link dxfImportGeometry} with the geometry as the truss model's objects: joints
 * { id, tag, x, y } and members { id, tag, from, to, layer }, the form stored and shown.
 */
export function dxfImport(parsed: DxfParsed | IDxf, options: DxfImportOptions = {}, limits: Partial<DxfExplodeLimits> = {}): DxfImportResult {
  const { geometry, ...rest } = dxfImportGeometry(parsed, options, limits);
  const model = dxfModelOf(geometry);
  return dxfHandover({ ...model, ...rest }, geometry);
}

const CODE_GROUPS: MemberGroup[] = ['other', 'top-chord', 'bottom-chord', 'web'];

/** The columns of a result's objects (ids 'j<n>' / 'm<n>' in order, as dxfModelOf makes them). */
function columnsOf(result: DxfImportResult): Pick<DxfGeometry, 'jointXY' | 'memberEnds' | 'memberLayer' | 'layerNames'> {
  const { joints, members } = result;
  const index = new Map(joints.map((j, k) => [j.id, k]));
  const jointXY = new Float64Array(2 * joints.length);
  joints.forEach((j, k) => {
    jointXY[2 * k] = j.x;
    jointXY[2 * k + 1] = j.y;
  });
  const layerNames: string[] = [];
  const layerIndex = new Map<string, number>();
  const memberEnds = new Int32Array(2 * members.length);
  const memberLayer = new Int32Array(members.length);
  members.forEach((m, i) => {
    memberEnds[2 * i] = index.get(m.from) ?? 0;
    memberEnds[2 * i + 1] = index.get(m.to) ?? 0;
    let li = layerIndex.get(m.layer);
    if (li === undefined) {
      li = layerNames.length;
      layerNames.push(m.layer);
      layerIndex.set(m.layer, li);
    }
    memberLayer[i] = li;
  });
  return { jointXY, memberEnds, memberLayer, layerNames };
}

const GROUP_WORDS: Record<MemberGroup, [string, string]> = {
  'top-chord': ['top chord member', 'top chord members'],
  'bottom-chord': ['bottom chord member', 'bottom chord members'],
  web: ['web', 'webs'],
  other: ['other member', 'other members'],
};

/** "A, B and C", or "A, B, C, D, E, F and 12 more": names in report lines. */
export function namesList(names: readonly string[], total = names.length, max = 6): string {
  const shown = names.slice(0, max);
  const rest = total - shown.length;
  if (rest > 0) return `${shown.join(', ')} and ${rest} more`;
  if (shown.length <= 1) return shown.join('');
  return `${shown.slice(0, -1).join(', ')} and ${shown[shown.length - 1]}`;
}

/**
 * What makes an imported drawing ready to hand over, added to {@link dxfImport}'s result:
 * member groups suggested from the layer names and the outline (groups.ts), each report line
 * naming the joints and members it concerns by their tags, and the check for a likely
 * mechanism with the usual supports assumed (mechanism.ts).
 */
export function dxfHandover(result: DxfImportResult, geometry?: DxfGeometry): DxfImportResult {
  const { joints, members, report } = result;
  // ---- groups, on the geometry's columns (members are in its order, m1 = row 0)
  const cols = geometry ?? columnsOf(result);
  const { codes, source, hints } = memberGroupCodes(cols.jointXY, cols.memberEnds, cols.memberLayer, cols.layerNames);
  const byLayer = new Map<string, Map<MemberGroup, number>>();
  let fromOutline = 0;
  let grouped = 0;
  const outlineCounts = new Map<MemberGroup, number>();
  const layerCounts = cols.layerNames.map(() => new Int32Array(4));
  const outlineCodeCounts = new Int32Array(4);
  for (let i = 0; i < members.length; i++) {
    const code = codes[i]!;
    if (!code) continue;
    members[i]!.group = CODE_GROUPS[code]!;
    grouped++;
    if (source[i] === 0) outlineCodeCounts[code]!++;
    else layerCounts[cols.memberLayer[i]!]![code]!++;
  }
  for (let code = 1; code < 4; code++) {
    if (outlineCodeCounts[code]) {
      fromOutline += outlineCodeCounts[code]!;
      outlineCounts.set(CODE_GROUPS[code]!, outlineCodeCounts[code]!);
    }
  }
  cols.layerNames.forEach((layer, li) => {
    const per = new Map<MemberGroup, number>();
    for (let code = 1; code < 4; code++) if (layerCounts[li]![code]) per.set(CODE_GROUPS[code]!, layerCounts[li]![code]!);
    if (per.size) byLayer.set(layer, per);
  });
  const hintOf = new Map(cols.layerNames.map((l, li) => [l, hints[li]]));
  const countWords = (c: Map<MemberGroup, number>) =>
    (['top-chord', 'bottom-chord', 'web', 'other'] as const)
      .filter((g) => c.get(g))
      .map((g) => `${c.get(g)} ${GROUP_WORDS[g][c.get(g) === 1 ? 0 : 1]}`)
      .join(', ');
  const layerParts = [...byLayer.entries()]
    .sort(([a], [b]) => (a < b ? -1 : a > b ? 1 : 0))
    .map(([layer, c]) => `${countWords(c)} from layer ${layer}${hintOf.get(layer) === 'chord' ? ' (top or bottom by the outline)' : ''}`);
  const parts = [...layerParts];
  if (fromOutline > 0) parts.push(`${countWords(outlineCounts)} by the outline (lower edge bottom chord, upper edge top chord, the rest webs)`);
  if (parts.length) {
    report.push({
      kind: 'member-groups',
      severity: 'info',
      count: grouped,
      message: `grouped the members: ${parts.join('; ')}; the roof loading can start from these, and Members changes them`,
      points: [],
      joints: [],
      members: [],
      layers: [...byLayer.keys()].sort(),
    });
  }

  // ---- a likely mechanism
  const found = mechanismCheck(joints, members);
  if (found) {
    report.push({
      kind: 'mechanism',
      severity: found.severity,
      count: found.severity === 'warning' ? 1 : 0,
      message: found.message,
      points: [], // its places are joints and members
      joints: found.joints.slice(0, DXF_REPORT_MAX_LOCATIONS),
      members: found.members,
    });
  }

  // ---- name what each line concerns, by tag (ids are 'j<n>' and 'm<n>' in order)
  const jointTag = (id: string) => joints[Number(id.slice(1)) - 1]?.tag ?? id;
  const memberTag = (id: string) => members[Number(id.slice(1)) - 1]?.tag ?? id;
  for (const e of report) {
    if (e.joints.length === 0 && e.members.length === 0) continue;
    e.jointTags = e.joints.map(jointTag);
    e.memberTags = e.members.map(memberTag);
    if (e.kind === 'mechanism') continue; // says its joints itself
    const named: string[] = [];
    if (e.members.length) named.push(`member${e.memberTags.length === 1 ? '' : 's'} ${namesList(e.memberTags)}`);
    if (e.joints.length) named.push(`joint${e.jointTags.length === 1 ? '' : 's'} ${namesList(e.jointTags)}`);
    e.message += `: ${named.join('; ')}`;
  }
  return result;
}

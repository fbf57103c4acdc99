import { z } from 'zod';
import type { IDxf } from 'dxf-parser';
import type { Joint, Member } from '@shared/model/truss';

/** Length units a user may choose for a drawing. */
export const dxfLengthUnitSchema = z.enum(['m', 'mm', 'cm', 'in', 'ft']);
/** 'm' metres, 'mm' millimetres, 'cm' centimetres, 'in' inches, 'ft' feet. */
export type DxfLengthUnit = z.infer<typeof dxfLengthUnitSchema>;

/**
 * Options of one import run. All optional: the defaults are every layer holding lines, the
 * units of the drawing's $INSUNITS header and a tolerance of 1/10 000 of the drawing's diagonal
 * rounded down to 1, 2 or 5 × 10ⁿ m. The upload API validates request bodies with this schema.
 */
export const dxfImportOptionsSchema = z.object({
  /** Layer names to take members from (exact, case-sensitive as in the file). */
  layers: z.array(z.string().min(1).max(255)).min(1).max(1000).optional(),
  /** Drawing units; required when the drawing is unitless, wins over $INSUNITS otherwise. */
  units: dxfLengthUnitSchema.optional(),
  /** Healing tolerance in metres: endpoints closer than this become one joint. */
  tolerance: z.number().positive().finite().optional(),
});
export type DxfImportOptions = z.infer<typeof dxfImportOptionsSchema>;

/** A point in metres, drawing axes (x right, y up). */
export interface DxfPoint {
  x: number;
  y: number;
}

/** Axis-aligned box in metres. */
export interface DxfExtent {
  minX: number;
  minY: number;
  maxX: number;
  maxY: number;
}

/**
 * What a drawing was parsed into by {@link dxfParse}: dxf-parser's object plus what our own
 * scan of the group codes saw that dxf-parser drops.
 */
export interface DxfParsed {
  /** dxf-parser's result. */
  dxf: IDxf;
  /** $ACADVER (e.g. 'AC1009' for R12, 'AC1015' for 2000), when present. */
  version: string | null;
  /** Entities dxf-parser does not read (HATCH, LEADER, …): type → layer → count, as written in the file. */
  unreadEntities: Record<string, Record<string, number>>;
  /** Number of text lines of the file. */
  lineCount: number;
}

/** One layer of a drawing, as listed by {@link dxfLayers}. */
export interface DxfLayerInfo {
  name: string;
  /** Entities on the layer by DXF type, blocks exploded (an INSERT counts once, plus what it holds). */
  counts: Record<string, number>;
  /** Straight segments the layer holds: LINEs plus LWPOLYLINE / 2D POLYLINE segments. */
  segments: number;
  /** True when the layer holds at least one straight segment (a default member layer). */
  holdsLines: boolean;
  /** Frozen or off in the file's layer table. */
  frozen: boolean;
  visible: boolean;
}

/** Kinds of report entries. */
export type DxfReportKind =
  | 'units'
  | 'layers'
  | 'tolerance'
  | 'merged-endpoints'
  | 'dropped-zero-length'
  | 'merged-duplicate'
  | 'merged-overlap'
  | 'split-member'
  | 'crossing'
  | 'dangling-member'
  | 'isolated-piece'
  | 'ignored-entity'
  | 'ignored-bulge'
  | 'joint-tags'
  | 'member-groups'
  | 'mechanism';

/**
 * One line of the import report. `count` is the full number of cases; the location lists
 * hold at most {@link DXF_REPORT_MAX_LOCATIONS} items each.
 */
export interface DxfReportEntry {
  kind: DxfReportKind;
  /** 'info' says what was read; 'change' says what healing changed; 'warning' needs a look. */
  severity: 'info' | 'change' | 'warning';
  count: number;
  /** One sentence, e.g. "merged 3 endpoints closer than 1 mm into joints". */
  message: string;
  /** Places to highlight, metres. */
  points: DxfPoint[];
  /** Ids of the joints concerned (ids of the returned model). */
  joints: string[];
  /** Ids of the members concerned (ids of the returned model). */
  members: string[];
  /** Tags of `joints`, as the model has them (dxfImport fills them; the message names them too). */
  jointTags?: string[];
  /** Tags of `members`, as the model has them. */
  memberTags?: string[];
  /** For 'ignored-entity': the DXF entity type, e.g. 'CIRCLE'. */
  entityType?: string;
  /** Layers concerned, where that says something. */
  layers?: string[];
}

/** A member as imported: the truss model's member plus the layer it was drawn on. */
export type DxfMember = Member & { layer: string };

/**
 * The healed geometry as columns, in id order: joint r is 'j(r + 1)', member r is 'm(r + 1)'.
 * Typed arrays instead of an object per joint and member: at 100 000 segments building those
 * objects costs more than all the healing (see bench/import.bench.ts).
 */
export interface DxfGeometry {
  /** Joint coordinates in metres, interleaved x, y, in reading order (rows top to bottom, left to right). */
  jointXY: Float64Array;
  /**
   * Tags texts in the drawing gave, by joint index; the other joints are named A, B, C, … in
   * reading order when the tags are asked for (dxfModelOf, jointTagsInOrder), skipping these.
   */
  textTags: Map<number, string>;
  /** Member ends as joint indices, interleaved from, to; `from` is the joint earlier in tag order. */
  memberEnds: Int32Array;
  /** Layer of each member, as an index into `layerNames`. */
  memberLayer: Int32Array;
  layerNames: string[];
}

/** What {@link dxfImport} and {@link dxfImportGeometry} say besides the joints and members. */
export interface DxfImportFacts {
  units: {
    /** The unit the drawing's numbers were read in. */
    name: string;
    /** Our short symbol when the user could have chosen it ('mm', 'in', …). */
    unit: DxfLengthUnit | null;
    metresPerUnit: number;
    /** $INSUNITS value of the file (0 when absent). */
    insunits: number;
    source: 'drawing' | 'option';
  };
  tolerance: { value: number; source: 'default' | 'option' };
  /** Extent of the segments taken, metres. */
  extent: DxfExtent;
  /** Layers members were taken from. */
  layers: string[];
  report: DxfReportEntry[];
}

/** The result of {@link dxfImportGeometry}: the healed geometry as columns, and what was done to it. */
export interface DxfGeometryResult extends DxfImportFacts {
  geometry: DxfGeometry;
}

/** The result of {@link dxfImport}: the healed geometry as the truss model's objects, and what was done to it. */
export interface DxfImportResult extends DxfImportFacts {
  /** Joints in metres, ids 'j1'… in reading order (rows top to bottom, left to right). */
  joints: Joint[];
  /** Members, ids 'm1'…, `from` is the joint earlier in tag order. */
  members: DxfMember[];
}

/** At most this many points / ids are listed per report entry (its count is always complete). */
export const DXF_REPORT_MAX_LOCATIONS = 500;

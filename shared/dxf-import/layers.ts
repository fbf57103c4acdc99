import type { IDxf } from 'dxf-parser';
import { AFFINE_IDENTITY, explodeDrawing, type DxfExplodeLimits } from './explode';
import type { DxfLayerInfo, DxfParsed } from './types';

/** Accepts our wrapper or dxf-parser's bare object. */
export function dxfOf(parsed: DxfParsed | IDxf): { dxf: IDxf; unread: DxfParsed['unreadEntities'] } {
  if (parsed && typeof parsed === 'object' && 'dxf' in parsed && (parsed as DxfParsed).dxf) {
    return { dxf: (parsed as DxfParsed).dxf, unread: (parsed as DxfParsed).unreadEntities ?? {} };
  }
  return { dxf: parsed as IDxf, unread: {} };
}

/**
 * Tallies entities and straight segments per layer while a drawing is exploded, so that the
 * import lists the layers in the same walk that collects the segments.
 */
export class LayerTally {
  private byName = new Map<string, DxfLayerInfo>();
  // entities come in long runs on one layer: the last layer met is kept at hand
  private lastName: string | null = null;
  private last: DxfLayerInfo | null = null;

  constructor(dxf: IDxf) {
    const table = dxf.tables?.layer?.layers ?? {};
    for (const [name, rec] of Object.entries(table)) {
      if (!name || name === 'undefined') continue;
      const l = this.get(name);
      l.frozen = rec?.frozen === true;
      l.visible = rec?.visible !== false;
    }
  }

  get(name: string): DxfLayerInfo {
    if (name === this.lastName) return this.last!;
    let l = this.byName.get(name);
    if (!l) {
      l = { name, counts: {}, segments: 0, holdsLines: false, frozen: false, visible: true };
      this.byName.set(name, l);
    }
    this.lastName = name;
    this.last = l;
    return l;
  }

  segment(layer: string): void {
    const l = this.get(layer);
    l.segments++;
    l.holdsLines = true;
  }

  entity(type: string, layer: string): void {
    const counts = this.get(layer).counts;
    counts[type] = (counts[type] ?? 0) + 1;
  }

  /** The layers sorted by name, with the entities dxf-parser could not read added from `unread`. */
  finish(unread: DxfParsed['unreadEntities']): DxfLayerInfo[] {
    for (const [type, perLayer] of Object.entries(unread)) {
      for (const [layer, n] of Object.entries(perLayer)) {
        const l = this.get(layer);
        l.counts[type] = (l.counts[type] ?? 0) + n;
      }
    }
    return [...this.byName.values()].sort((a, b) => (a.name < b.name ? -1 : a.name > b.name ? 1 : 0));
  }
}

/**
 * Every layer of a drawing — those in its layer table and those entities name — with entity
 * counts by type (blocks exploded, so a web drawn once in a block and inserted six times
 * counts six LINEs), the number of straight segments it holds, and whether it is a default
 * member layer. Sorted by name. Entities dxf-parser cannot read (HATCH, …) are counted from
 * the file's text. Pure; never throws for a drawing {@link dxfParse} accepted, except
 * DxfImportError 'block-problem' for self-referencing or too deeply nested blocks and
 * 'drawing-too-large' past `limits.maxSegments` (see {@link explodeDrawing}).
 */
export function dxfLayers(parsed: DxfParsed | IDxf, limits: Partial<DxfExplodeLimits> = {}): DxfLayerInfo[] {
  const { dxf, unread } = dxfOf(parsed);
  const tally = new LayerTally(dxf);
  explodeDrawing(dxf, AFFINE_IDENTITY, {
    segment(layer) {
      tally.segment(layer);
    },
    text() {},
    entity(type, layer) {
      tally.entity(type, layer);
    },
    ignored() {},
    notFlat(layer, _entity, _zMin, _zMax, spans) {
      // listed as holding lines, so the import can say why it refuses the layer
      for (let i = 0; i < spans; i++) tally.segment(layer);
    },
  }, limits);
  return tally.finish(unread);
}

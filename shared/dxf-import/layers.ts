import type { IDxf } from 'dxf-parser';
import { AFFINE_IDENTITY, explodeDrawing } from './explode';
import type { DxfLayerInfo, DxfParsed } from './types';

/** Accepts our wrapper or dxf-parser's bare object. */
export function dxfOf(parsed: DxfParsed | IDxf): { dxf: IDxf; unread: DxfParsed['unreadEntities'] } {
  if (parsed && typeof parsed === 'object' && 'dxf' in parsed && (parsed as DxfParsed).dxf) {
    return { dxf: (parsed as DxfParsed).dxf, unread: (parsed as DxfParsed).unreadEntities ?? {} };
  }
  return { dxf: parsed as IDxf, unread: {} };
}

/**
 * Every layer of a drawing — those in its layer table and those entities name — with entity
 * counts by type (blocks exploded, so a web drawn once in a block and inserted six times
 * counts six LINEs), the number of straight segments it holds, and whether it is a default
 * member layer. Sorted by name. Entities dxf-parser cannot read (HATCH, …) are counted from
 * the file's text. Pure; never throws for a drawing {@link dxfParse} accepted, except
 * DxfImportError 'block-problem' for self-referencing blocks.
 */
export function dxfLayers(parsed: DxfParsed | IDxf): DxfLayerInfo[] {
  const { dxf, unread } = dxfOf(parsed);
  const byName = new Map<string, DxfLayerInfo>();
  const get = (name: string): DxfLayerInfo => {
    let l = byName.get(name);
    if (!l) {
      l = { name, counts: {}, segments: 0, holdsLines: false, frozen: false, visible: true };
      byName.set(name, l);
    }
    return l;
  };
  const table = dxf.tables?.layer?.layers ?? {};
  for (const [name, rec] of Object.entries(table)) {
    if (!name || name === 'undefined') continue;
    const l = get(name);
    l.frozen = rec?.frozen === true;
    l.visible = rec?.visible !== false;
  }
  explodeDrawing(dxf, AFFINE_IDENTITY, {
    segment(layer) {
      const l = get(layer);
      l.segments++;
      l.holdsLines = true;
    },
    text() {},
    entity(type, layer) {
      const l = get(layer);
      l.counts[type] = (l.counts[type] ?? 0) + 1;
    },
    ignored() {},
  });
  for (const [type, perLayer] of Object.entries(unread)) {
    for (const [layer, n] of Object.entries(perLayer)) {
      const l = get(layer);
      l.counts[type] = (l.counts[type] ?? 0) + n;
    }
  }
  return [...byName.values()].sort((a, b) => (a.name < b.name ? -1 : a.name > b.name ? 1 : 0));
}

// Drawings written at test time by two general-purpose DXF writers from the npm registry:
// "@tarikjabiri/dxf" (writes AC1021, i.e. R2007 flavour) and "dxf-writer" (also AC1021).
// Expected joints are the coordinates handed to the writers (closed form).
import { describe, expect, it } from 'vitest';
import { kingPostInches, pitchedTrussMm } from './fixtures/dxf/writer-drawings';
import { dxfImport, dxfLayers, dxfParse, type DxfImportResult, type DxfReportKind } from '@shared/dxf-import';

function entries(r: DxfImportResult, kind: DxfReportKind) {
  return r.report.filter((x) => x.kind === kind);
}
function jointAt(r: DxfImportResult, x: number, y: number, eps = 1e-9) {
  const j = r.joints.find((p) => Math.abs(p.x - x) < eps && Math.abs(p.y - y) < eps);
  expect(j, `joint at (${x}, ${y})`).toBeDefined();
  return j!;
}
function hasMember(r: DxfImportResult, a: string, b: string) {
  return r.members.some((m) => (m.from === a && m.to === b) || (m.from === b && m.to === a));
}

describe('pitched truss in millimetres written by @tarikjabiri/dxf (AC1021)', () => {
  const parsed = dxfParse(pitchedTrussMm());
  const r = dxfImport(parsed);

  it('when imported with defaults, then 8 joints and 13 members lie where they were drawn', () => {
    expect(r.units).toMatchObject({ unit: 'mm', insunits: 4, source: 'drawing' });
    expect(r.joints).toHaveLength(8);
    expect(r.members).toHaveLength(13);
    const pts = [[0, 0], [2, 0], [4, 0], [6, 0], [8, 0], [2, 1], [4, 2], [6, 1]];
    for (const [x, y] of pts) jointAt(r, x, y);
    expect(r.layers).toEqual(['CHORDS', 'WEBS']);
  });

  it('when webs come from nested, mirrored and rotated blocks, then each web joins the right joints', () => {
    const id = (x: number, y: number) => jointAt(r, x, y).id;
    expect(hasMember(r, id(2, 0), id(2, 1))).toBe(true); // post from HALFWEB
    expect(hasMember(r, id(2, 1), id(4, 0))).toBe(true); // diagonal from HALFWEB
    expect(hasMember(r, id(6, 0), id(6, 1))).toBe(true); // post from the nested, mirrored copy
    expect(hasMember(r, id(6, 1), id(4, 0))).toBe(true); // its diagonal, mirrored to point left
    expect(hasMember(r, id(4, 0), id(4, 2))).toBe(true); // king post, rotated 90°
  });

  it('when chords run whole length, then both are split at their panel points', () => {
    const s = entries(r, 'split-member');
    expect(s).toHaveLength(1);
    expect(s[0].count).toBe(3); // bottom chord LINE, two top-chord polyline spans
    expect(s[0].message).toBe('split 3 members at 5 joints lying on them: members KA, KB, AC, BG, CD, DE and 2 more; joints A, B, D, E and F');
  });

  it('when an MTEXT "K" sits above the apex, then the apex is K and the rest follow reading order', () => {
    expect(jointAt(r, 4, 2).tag).toBe('K');
    expect(r.joints.map((j) => j.tag)).toEqual(['K', 'A', 'B', 'C', 'D', 'E', 'F', 'G']);
  });

  it('when a hatch, a circle and a dimension lie on DIMENSIONS, then each is counted as ignored', () => {
    const ignored = Object.fromEntries(entries(r, 'ignored-entity').map((e) => [e.entityType, e.count]));
    expect(ignored).toMatchObject({ HATCH: 1, CIRCLE: 1, DIMENSION: 1 });
    const layers = dxfLayers(parsed);
    expect(layers.find((l) => l.name === 'DIMENSIONS')!.counts).toMatchObject({ HATCH: 1, CIRCLE: 1, DIMENSION: 1, MTEXT: 1 });
    expect(layers.find((l) => l.name === 'WEBS')!.segments).toBe(5);
  });
});

describe('king-post truss in inches written by dxf-writer (AC1021)', () => {
  const r = dxfImport(dxfParse(kingPostInches()));

  it('when $INSUNITS is 1, then inches become metres at 0.0254 m per inch', () => {
    expect(r.units).toMatchObject({ unit: 'in', metresPerUnit: 0.0254, source: 'drawing' });
    expect(r.joints).toHaveLength(4);
    expect(r.members).toHaveLength(5);
    // 288 in = 7.3152 m, 144 in = 3.6576 m, 48 in = 1.2192 m (exact by the inch's definition)
    expect(jointAt(r, 0, 0, 1e-9).tag).toBe('P');
    expect(jointAt(r, 7.3152, 0, 1e-9).tag).toBe('Q');
    expect(jointAt(r, 3.6576, 1.2192, 1e-9).tag).toBe('R');
    expect(jointAt(r, 3.6576, 0, 1e-9).tag).toBe('A');
    // reading order R (top row), then P, A, Q; a member's tag starts with its earlier joint
    expect(r.members.map((m) => m.tag)).toEqual(['RP', 'RA', 'RQ', 'PA', 'AQ']);
  });

  it('when the closed outline meets the king post, then the bottom span is split once and the circle ignored', () => {
    expect(entries(r, 'split-member')[0]).toMatchObject({ count: 1, points: [{ x: expect.closeTo(3.6576, 12), y: 0 }] });
    expect(entries(r, 'ignored-entity').map((e) => e.entityType)).toEqual(['CIRCLE']);
  });

  it('when the user overrides inches with feet, then the report warns and coordinates scale by 0.3048', () => {
    const f = dxfImport(dxfParse(kingPostInches()), { units: 'ft' });
    expect(entries(f, 'units')[0]).toMatchObject({ severity: 'warning', message: 'read the drawing in feet as chosen, although it says it is drawn in inches' });
    jointAt(f, 288 * 0.3048, 0, 1e-9);
  });
});

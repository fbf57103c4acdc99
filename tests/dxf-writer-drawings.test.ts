// Drawings written at test time by two general-purpose DXF writers from the npm registry:
// "@tarikjabiri/dxf" (writes AC1021, i.e. R2007 flavour) and "dxf-writer" (also AC1021).
// Expected joints are the coordinates handed to the writers (closed form).
import { describe, expect, it } from 'vitest';
import {
  DxfWriter,
  HatchBoundaryPaths,
  HatchPolylineBoundary,
  HatchPredefinedPatterns,
  MTextAttachmentPoint,
  Units,
  pattern,
  point3d,
  vertex,
} from '@tarikjabiri/dxf';
import Drawing from 'dxf-writer';
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

/**
 * Pitched truss, span 8000 mm, rise 2000 mm, written with @tarikjabiri/dxf: bottom chord one
 * LINE, top chord one LWPOLYLINE over the apex, webs from blocks (nested, one mirrored by
 * x-scale −1, one rotated 90°), an MTEXT tag, and a hatch, circle and dimension on DIMENSIONS.
 */
function pitchedTrussMm(): string {
  const d = new DxfWriter();
  d.setUnits(Units.Millimeters);
  d.addLayer('CHORDS', 1);
  d.addLayer('WEBS', 2);
  d.addLayer('DIMENSIONS', 3);
  const half = d.addBlock('HALFWEB');
  half.addLine(point3d(0, 0), point3d(0, 1000));
  half.addLine(point3d(0, 1000), point3d(2000, 0));
  const mirrored = d.addBlock('HALFWEB_M');
  mirrored.addInsert('HALFWEB', point3d(0, 0), { scaleFactor: { x: -1, y: 1, z: 1 } });
  const kp = d.addBlock('KINGPOST');
  kp.addLine(point3d(0, 0), point3d(2000, 0));
  d.addLine(point3d(0, 0), point3d(8000, 0), { layerName: 'CHORDS' });
  d.addLWPolyline([{ point: { x: 0, y: 0 } }, { point: { x: 4000, y: 2000 } }, { point: { x: 8000, y: 0 } }], { layerName: 'CHORDS' });
  d.addInsert('HALFWEB', point3d(2000, 0), { layerName: 'WEBS' });
  d.addInsert('HALFWEB_M', point3d(6000, 0), { layerName: 'WEBS' });
  d.addInsert('KINGPOST', point3d(4000, 0), { layerName: 'WEBS', rotationAngle: 90 });
  d.addMText(point3d(4000, 2150), 200, 'K', { layerName: 'DIMENSIONS', attachmentPoint: MTextAttachmentPoint.BottomCenter });
  const boundary = new HatchPolylineBoundary();
  for (const [x, y] of [[0, -500], [1000, -500], [1000, -1000], [0, -1000]]) boundary.add(vertex(x, y));
  const paths = new HatchBoundaryPaths();
  paths.addPolylineBoundary(boundary);
  d.addHatch(paths, pattern({ name: HatchPredefinedPatterns.ANSI31 }), { layerName: 'DIMENSIONS' });
  d.addCircle(point3d(4000, -800), 200, { layerName: 'DIMENSIONS' });
  d.addLinearDim(point3d(0, 0), point3d(8000, 0), { offset: -1500, layerName: 'DIMENSIONS' });
  return d.stringify();
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
    expect(s[0].message).toBe('split 3 members at 5 joints lying on them');
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

/** King-post truss, span 288 in, rise 48 in, written with dxf-writer: closed polyline outline, king post, text tags. */
function kingPostInches(): string {
  const w = new Drawing();
  w.setUnits('Inches');
  w.addLayer('TRUSS', Drawing.ACI.RED, 'CONTINUOUS');
  w.addLayer('TAGS', Drawing.ACI.GREEN, 'CONTINUOUS');
  w.setActiveLayer('TRUSS');
  w.drawPolyline([[0, 0], [288, 0], [144, 48]], true);
  w.drawLine(144, 0, 144, 48);
  w.setActiveLayer('TAGS');
  w.drawText(-10, -12, 6, 0, 'P');
  w.drawText(282, -12, 6, 0, 'Q');
  w.drawText(141, 52, 6, 0, 'R');
  w.drawCircle(144, -40, 4);
  return w.toDxfString();
}

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

// Drawings written by hand in the DXF group-code format (DXF Reference, Autodesk): an R12
// (AC1009) file without units and an R2000 (AC1015) file in millimetres with drafting faults.
// Expected joints are the coordinates the files were drawn with (closed form: mm ÷ 1000).
import { readFileSync } from 'node:fs';
import path from 'node:path';
import { describe, expect, it } from 'vitest';
import { dxfImport, dxfLayers, dxfParse, DxfImportError, type DxfImportResult, type DxfReportKind } from '@shared/dxf-import';

const dir = path.resolve(__dirname, 'fixtures/dxf');
const read = (f: string) => readFileSync(path.join(dir, f), 'latin1');

function entry(r: DxfImportResult, kind: DxfReportKind) {
  const e = r.report.filter((x) => x.kind === kind);
  expect(e.length, `report entries of kind ${kind}`).toBe(1);
  return e[0];
}
function jointAt(r: DxfImportResult, x: number, y: number) {
  const j = r.joints.find((p) => Math.abs(p.x - x) < 1e-9 && Math.abs(p.y - y) < 1e-9);
  expect(j, `joint at (${x}, ${y})`).toBeDefined();
  return j!;
}
function memberBetween(r: DxfImportResult, a: string, b: string) {
  return r.members.filter((m) => (m.from === a && m.to === b) || (m.from === b && m.to === a));
}

describe('R12 four-panel truss, unitless (hand-written, AC1009)', () => {
  const parsed = dxfParse(read('r12-four-panel-unitless.dxf'));

  it('when the drawing is unitless and no units are chosen, then the import asks for units', () => {
    expect(() => dxfImport(parsed)).toThrowError(DxfImportError);
    try {
      dxfImport(parsed);
    } catch (e) {
      expect((e as DxfImportError).code).toBe('units-required');
      expect((e as DxfImportError).message).toMatch(/Choose the units/);
    }
  });

  it('when read in millimetres, then 10 joints and 17 members lie where they were drawn', () => {
    const r = dxfImport(parsed, { units: 'mm' });
    expect(parsed.version).toBe('AC1009');
    expect(r.units).toMatchObject({ unit: 'mm', metresPerUnit: 0.001, source: 'option' });
    expect(r.joints).toHaveLength(10);
    expect(r.members).toHaveLength(17);
    for (let i = 0; i <= 4; i++) {
      expect(jointAt(r, 3 * i, 0).tag).toBe(`L${i}`);
      expect(jointAt(r, 3 * i, 2).tag).toBe(`U${i}`);
    }
    expect(r.extent).toEqual({ minX: 0, minY: 0, maxX: 12, maxY: 2 });
  });

  it('when posts come from blocks (plain, mirrored by y-scale −1, rotated 90° with base point and x-scale 2), then each is a vertical member', () => {
    const r = dxfImport(parsed, { units: 'mm' });
    for (const x of [0, 3, 6, 9, 12]) {
      const posts = memberBetween(r, jointAt(r, x, 0).id, jointAt(r, x, 2).id);
      expect(posts, `post at x = ${x}`).toHaveLength(1);
      expect(posts[0].layer).toBe('TRUSS');
    }
  });

  it('when the bottom chord is one line over four panels, then it is split at 3 joints and reported', () => {
    const r = dxfImport(parsed, { units: 'mm' });
    const e = entry(r, 'split-member');
    expect(e.count).toBe(1);
    expect(e.message).toBe('split 1 member at 3 joints lying on it: members L0-L1, L1-L2, L2-L3 and L3-L4; joints L1, L2 and L3');
    expect(e.points).toEqual([{ x: 3, y: 0 }, { x: 6, y: 0 }, { x: 9, y: 0 }]);
    expect(e.members).toHaveLength(4);
    expect(memberBetween(r, jointAt(r, 0, 0).id, jointAt(r, 3, 0).id)[0].tag).toBe('L0-L1');
  });

  it('when texts L0…U4 sit beside the joints, then they become the tags and the title and circle are ignored', () => {
    const r = dxfImport(parsed, { units: 'mm' });
    expect(entry(r, 'joint-tags').message).toBe('took 10 joint labels from texts near the joints: joints U0, U1, U2, U3, U4, L0 and 4 more');
    const ignored = r.report.filter((x) => x.kind === 'ignored-entity');
    expect(ignored.map((x) => [x.entityType, x.count, x.layers])).toEqual([
      ['CIRCLE', 1, ['ANNO']],
      ['TEXT', 1, ['ANNO']],
    ]);
    expect(ignored[1].message).toBe('ignored 1 text (not a joint label) on layer ANNO');
    for (const k of ['merged-endpoints', 'merged-duplicate', 'merged-overlap', 'crossing', 'dangling-member', 'isolated-piece'] as const) {
      expect(r.report.some((x) => x.kind === k), k).toBe(false);
    }
  });

  it('when layers are listed, then TRUSS holds the 14 segments and ANNO the texts and circle', () => {
    const layers = dxfLayers(parsed);
    expect(layers.map((l) => l.name)).toEqual(['0', 'ANNO', 'TRUSS']);
    const truss = layers.find((l) => l.name === 'TRUSS')!;
    expect(truss.segments).toBe(14); // 1 + 4 polyline spans + 2 + 3 inserted + 4 diagonals
    expect(truss.counts).toEqual({ LINE: 10, POLYLINE: 1, INSERT: 3 });
    expect(layers.find((l) => l.name === 'ANNO')!.counts).toEqual({ TEXT: 11, CIRCLE: 1 });
    expect(layers.filter((l) => l.holdsLines).map((l) => l.name)).toEqual(['TRUSS']);
  });
});

describe('R2000 three-panel truss with drafting faults, millimetres (hand-written, AC1015)', () => {
  const parsed = dxfParse(read('r2000-faults-mm.dxf'));
  const r = dxfImport(parsed);

  it('when $INSUNITS is 4, then the drawing is read in millimetres and the tolerance defaults to 0.5 mm', () => {
    expect(parsed.version).toBe('AC1015');
    expect(r.units).toMatchObject({ unit: 'mm', insunits: 4, source: 'drawing' });
    // diagonal √(9000² + 1500²) mm = 9124 mm; /10 000 = 0.91 mm, rounded down to 0.5 mm
    expect(r.tolerance).toEqual({ value: 0.0005, source: 'default' });
  });

  it('when healed, then 11 joints and 13 members remain with the seven panel points in place', () => {
    expect(r.joints).toHaveLength(11);
    expect(r.members).toHaveLength(13);
    for (const [x, y] of [[0, 0], [2, 0], [4, 0], [6, 0], [1, 1.5], [3, 1.5], [5, 1.5]]) jointAt(r, x, y);
    // the nested PAIR block (second WEB mirrored by x-scale −1) gives the two last webs, layer WEBS
    const g = jointAt(r, 4, 0).id;
    const b = jointAt(r, 5, 1.5).id;
    const h = jointAt(r, 6, 0).id;
    expect(memberBetween(r, g, b)[0].layer).toBe('WEBS');
    expect(memberBetween(r, b, h)[0].layer).toBe('WEBS');
  });

  it('when an endpoint is 0.4 mm off a panel point, then it is merged and reported', () => {
    const e = entry(r, 'merged-endpoints');
    expect(e.count).toBe(1);
    expect(e.message).toBe('merged 1 endpoint closer than 0.5 mm into 1 joint: joint F');
    expect(e.points).toEqual([{ x: 2, y: 0 }]);
  });

  it('when a line has zero length, a web is drawn twice and chords overlap, then each is reported', () => {
    expect(entry(r, 'dropped-zero-length')).toMatchObject({ count: 1, points: [{ x: 5, y: 1.5 }] });
    const dup = entry(r, 'merged-duplicate');
    expect(dup).toMatchObject({ count: 1, points: [{ x: 3.5, y: 0.75 }] });
    expect(dup.members).toEqual(memberBetween(r, jointAt(r, 3, 1.5).id, jointAt(r, 4, 0).id).map((m) => m.id));
    const split = entry(r, 'split-member');
    expect(split).toMatchObject({ count: 2, message: 'split 2 members at 2 joints lying on them: members EF, FG and GH; joints F and G', points: [{ x: 2, y: 0 }, { x: 4, y: 0 }] });
    const ov = entry(r, 'merged-overlap');
    expect(ov).toMatchObject({ count: 1, points: [{ x: 3, y: 0 }] });
    expect(memberBetween(r, jointAt(r, 2, 0).id, jointAt(r, 4, 0).id)).toHaveLength(1);
  });

  it('when a stray line crosses a web and another lies apart, then crossing, dangling and pieces are reported', () => {
    const c = entry(r, 'crossing');
    expect(c.count).toBe(1);
    // the web (2, 0)–(3, 1.5) is y = 1.5 (x − 2); at x = 2.6, y = 0.9
    expect(c.points[0].x).toBeCloseTo(2.6, 9);
    expect(c.points[0].y).toBeCloseTo(0.9, 9);
    expect(c.message).toBe('2 members cross without a joint at (2.60, 0.90) m; they were left apart: members APEX-F and CD');
    expect(entry(r, 'dangling-member').count).toBe(2);
    const iso = entry(r, 'isolated-piece');
    expect(iso.count).toBe(2);
    expect(iso.points).toEqual([{ x: 2.6, y: 0.8 }, { x: 8.5, y: 0 }].map((p) => expect.objectContaining({ x: expect.closeTo(p.x, 9), y: expect.closeTo(p.y, 9) })));
  });

  it('when the top chord has a bulge, then the arc span is a straight member and reported', () => {
    expect(entry(r, 'ignored-bulge')).toMatchObject({ count: 1, points: [{ x: 2, y: 1.5 }] });
    const arc = memberBetween(r, jointAt(r, 1, 1.5).id, jointAt(r, 3, 1.5).id);
    expect(arc).toHaveLength(1);
    // the line names the member the arc span became, by id and by tag
    expect(entry(r, 'ignored-bulge').members).toEqual([arc[0].id]);
    const tag = arc[0].tag;
    expect(entry(r, 'ignored-bulge').message).toMatch(new RegExp(`: member ${tag}$`));
  });

  it('when an MTEXT with formatting sits over the apex, then it tags that joint and the others follow reading order', () => {
    expect(jointAt(r, 3, 1.5).tag).toBe('APEX');
    expect(r.joints.map((j) => j.tag)).toEqual(['A', 'APEX', 'B', 'C', 'D', 'E', 'F', 'G', 'H', 'I', 'J']);
    expect(memberBetween(r, jointAt(r, 1, 1.5).id, jointAt(r, 3, 1.5).id)[0].tag).toBe('A-APEX');
    expect(memberBetween(r, jointAt(r, 0, 0).id, jointAt(r, 2, 0).id)[0].tag).toBe('EF');
    expect(entry(r, 'ignored-entity')).toMatchObject({ entityType: 'ARC', count: 1, layers: ['DIMENSIONS'] });
  });

  it('when only CHORDS is chosen, then 7 joints and 5 members come in, in two pieces', () => {
    const c = dxfImport(parsed, { layers: ['CHORDS'] });
    expect(c.joints).toHaveLength(7);
    expect(c.members).toHaveLength(5);
    expect(entry(c, 'isolated-piece').count).toBe(1);
    expect(entry(c, 'layers').message).toBe('took members from layer CHORDS (4 segments); left out layer holding lines: WEBS');
  });

  it('when the tolerance is tightened to 0.1 mm, then the 0.4 mm gap stays open and that web dangles', () => {
    const t = dxfImport(parsed, { tolerance: 0.0001 });
    expect(t.joints).toHaveLength(12);
    expect(t.report.some((x) => x.kind === 'merged-endpoints')).toBe(false);
    const d = entry(t, 'dangling-member');
    expect(d.count).toBe(3);
    expect(d.points).toContainEqual({ x: 2, y: 0.0004 });
  });

  it('when a layer that does not exist or holds no lines is chosen, then the import says which layers hold lines', () => {
    expect(() => dxfImport(parsed, { layers: ['NOPE'] })).toThrowError(/no layer "NOPE"/);
    try {
      dxfImport(parsed, { layers: ['DIMENSIONS'] });
      expect.unreachable();
    } catch (e) {
      expect((e as DxfImportError).code).toBe('no-lines');
      expect((e as DxfImportError).message).toMatch(/Layers holding lines: "CHORDS", "WEBS"/);
    }
  });

  it('when the tolerance exceeds half the typical member length, then the import refuses it', () => {
    expect(() => dxfImport(parsed, { tolerance: 1.2 })).toThrowError(/more than half the typical member length/);
  });
});

// Drawings that hand over cleanly (issue 15 item 5): groups from layer names and the outline,
// flat 3D polylines, "no lines" before units, report lines naming joints and members, a likely
// mechanism told at import. Fixtures are written by hand with tests/support/hostile-dxf.ts.
import { describe, expect, it } from 'vitest';
import { dxfImport, dxfParseBytes, DxfImportError, mechanismCheck, MECHANISM_RANK_MAX_JOINTS, type DxfImportResult } from '@shared/dxf-import';
import { circle, dxf, dxfIn, line, parallelChordTruss, polyline } from './support/hostile-dxf';

const importOf = (bytes: Buffer, options = {}) => dxfImport(dxfParseBytes(bytes), options);
const refusal = (f: () => unknown): DxfImportError => {
  try {
    f();
  } catch (e) {
    expect(e).toBeInstanceOf(DxfImportError);
    return e as DxfImportError;
  }
  throw new Error('expected a DxfImportError');
};
const groupsOf = (r: DxfImportResult, g: string) => r.members.filter((m) => m.group === g).map((m) => m.tag).sort();
const entry = (r: DxfImportResult, kind: string) => r.report.find((e) => e.kind === kind);

// Three panels of 3 m by 2 m (metres). Tags in reading order: top row A B C D, bottom E F G H.
describe('member groups from layer names and the outline', () => {
  it('when chords are on CHORDS and webs on WEBS, then the upper chord is top chord, the lower bottom chord, the rest webs', () => {
    const r = importOf(dxf(parallelChordTruss({ panels: 3, a: 3, h: 2 })));
    expect(groupsOf(r, 'top-chord')).toEqual(['AB', 'BC', 'CD']);
    expect(groupsOf(r, 'bottom-chord')).toEqual(['EF', 'FG', 'GH']);
    // four posts and a diagonal per panel: E–B and F–C rising to the middle, C–H falling
    expect(groupsOf(r, 'web')).toEqual(['AE', 'BE', 'BF', 'CF', 'CG', 'CH', 'DH']);
    expect(r.members.every((m) => m.group)).toBe(true);
    expect(entry(r, 'member-groups')!.message).toBe(
      'grouped the members: 3 top chord members, 3 bottom chord members from layer CHORDS (top or bottom by the outline); 7 webs from layer WEBS; the roof loading can start from these, and Members changes them',
    );
  });

  it('when the layers are TC, BC and DIAG, then the layer names decide, even where the outline would not', () => {
    // The "top chord" is drawn low and the "bottom chord" high: only the names can say so.
    const r = importOf(dxf(parallelChordTruss({ panels: 2, a: 3, h: 2, topLayer: 'BC', bottomLayer: 'TC', webLayer: 'DIAG' })));
    expect(groupsOf(r, 'bottom-chord')).toEqual(['AB', 'BC']);
    expect(groupsOf(r, 'top-chord')).toEqual(['DE', 'EF']);
    expect(entry(r, 'member-groups')!.message).toMatch(/^grouped the members: 2 bottom chord members from layer BC; 5 webs from layer DIAG; 2 top chord members from layer TC;/);
  });

  it('when a scissor truss has its raised bottom chord on CHORDS, then it is bottom chord (the outline alone would call it webs)', () => {
    // span 12 m, apex (6, 3), bottom chord rising to (6, 1)
    const chords = [line(0, 0, 3, 1.5, 'CHORDS'), line(3, 1.5, 6, 3, 'CHORDS'), line(6, 3, 9, 1.5, 'CHORDS'), line(9, 1.5, 12, 0, 'CHORDS'), line(0, 0, 6, 1, 'CHORDS'), line(6, 1, 12, 0, 'CHORDS')];
    const webs = [line(3, 1.5, 6, 1, 'WEBS'), line(6, 1, 6, 3, 'WEBS'), line(6, 1, 9, 1.5, 'WEBS')];
    const r = importOf(dxf([...chords, ...webs]));
    const tagAt = (x: number, y: number) => r.joints.find((j) => Math.abs(j.x - x) < 1e-9 && Math.abs(j.y - y) < 1e-9)!.tag;
    const bottom = groupsOf(r, 'bottom-chord');
    expect(bottom).toHaveLength(2);
    expect(bottom).toContain([tagAt(0, 0), tagAt(6, 1)].sort((a, b) => r.joints.findIndex((j) => j.tag === a) - r.joints.findIndex((j) => j.tag === b)).join(''));
    expect(groupsOf(r, 'top-chord')).toHaveLength(4);
    expect(groupsOf(r, 'web')).toHaveLength(3);
  });

  it('when the layer name says nothing, then the outline groups the members as the Members tab would', () => {
    const r = importOf(dxf(parallelChordTruss({ panels: 3, a: 3, h: 2, chordLayer: 'TRUSS', webLayer: 'TRUSS' })));
    expect(groupsOf(r, 'top-chord')).toEqual(['AB', 'BC', 'CD']);
    expect(groupsOf(r, 'bottom-chord')).toEqual(['EF', 'FG', 'GH']);
    expect(entry(r, 'member-groups')!.message).toMatch(/3 top chord members, 3 bottom chord members, 7 webs by the outline/);
  });
});

describe('3D polylines', () => {
  it('when a 3D polyline lies flat at z = 1.5 m, then it is read in plan like a 2D one', () => {
    const r = importOf(dxf([polyline([[0, 0, 1.5], [4, 0, 1.5], [2, 1.5, 1.5], [0, 0, 1.5]], 'TRUSS')]));
    expect(r.joints).toHaveLength(3);
    expect(r.members).toHaveLength(3);
    expect(r.report.some((e) => e.kind === 'ignored-entity')).toBe(false);
  });

  it('when a POLYLINE without the 3D flag has vertices at one z, then it is read too', () => {
    const r = importOf(dxf([polyline([[0, 0, 2], [4, 0, 2], [2, 1.5, 2]], 'TRUSS', 1)]));
    expect(r.members).toHaveLength(3);
  });

  it('when a 3D polyline rises in z, then the import is refused naming the entity, its layer and the z range', () => {
    const e = refusal(() => importOf(dxfIn(4, [polyline([[0, 0, 0], [4000, 0, 0], [2000, 1500, 750]], 'TRUSS')])));
    expect(e.code).toBe('not-planar');
    expect(e.message).toBe(
      `The 3D POLYLINE (handle 2F, layer "TRUSS") does not lie flat: its vertices' z runs from 0 mm to 750 mm (750 mm apart), so it is not in one plane parallel to XY. Draw the truss flat (all z equal) in your CAD program, or leave layer "TRUSS" out with the layers option, and upload again.`,
    );
  });

  it('when the polyline that is not flat is on a layer left out, then the rest imports', () => {
    const r = importOf(dxf([line(0, 0, 4, 0, 'CHORDS'), line(4, 0, 2, 1.5, 'CHORDS'), line(2, 1.5, 0, 0, 'CHORDS'), polyline([[0, -2, 0], [4, -2, 1]], 'SITE')]), { layers: ['CHORDS'] });
    expect(r.members).toHaveLength(3);
  });

  it('when z differs by less than 1/10 000 of the polyline in plan, then it counts as flat', () => {
    const r = importOf(dxf([polyline([[0, 0, 0], [4, 0, 0.0003], [2, 1.5, 0], [0, 0, 0]], 'TRUSS')]));
    expect(r.members).toHaveLength(3);
  });
});

describe('a file with no lines', () => {
  it('when a unitless file holds only a circle, then it is told it holds no lines, not asked for its units', () => {
    const e = refusal(() => importOf(dxfIn(0, [circle(0, 0, 1)])));
    expect(e.code).toBe('no-lines');
    expect(e.message).toBe('The drawing holds no lines or polylines on any layer (it holds 1 circle). Draw the truss members as lines or polylines and upload again.');
  });

  it('when a unitless file holds lines, then it is still asked for its units', () => {
    expect(refusal(() => importOf(dxfIn(0, [line(0, 0, 4, 0), line(4, 0, 2, 1), line(2, 1, 0, 0)]))).code).toBe('units-required');
  });
});

describe('report lines name their joints and members', () => {
  it('when an endpoint is merged and a member split, then the lines give their tags as the model has them', () => {
    // bottom chord drawn as one line through the post's foot at (3, 0); the diagonal ends 0.1 mm short of (3, 2)
    const r = importOf(dxf([line(0, 0, 6, 0), line(0, 0, 3, 2), line(3, 2.0001, 6, 0), line(3, 0, 3, 2)]));
    // reading order: (3, 2) alone on the top row is A; the bottom row (0, 0), (3, 0), (6, 0) is B, C, D
    const split = entry(r, 'split-member')!;
    expect(split.message).toBe('split 1 member at 1 joint lying on it: members BC and CD; joint C');
    expect(split.memberTags).toEqual(['BC', 'CD']);
    expect(split.jointTags).toEqual(['C']);
    const merged = entry(r, 'merged-endpoints')!;
    expect(merged.message).toMatch(/into 1 joint: joint A$/);
  });
});

describe('a likely mechanism at import', () => {
  it('when all three panels have a diagonal, then m + r = 13 + 3 = 16 = 2j and it says the members form a rigid truss', () => {
    // j = 8, m = 13: a simple truss built of triangles, m = 2j − 3 (any statics text, from memory)
    const r = importOf(dxf(parallelChordTruss({ panels: 3, a: 3, h: 2 })));
    const e = entry(r, 'mechanism')!;
    expect(e.severity).toBe('info');
    expect(e.message).toMatch(/m \+ r = 16 ≥ 2j = 16/);
    expect(e.message).toMatch(/rigid truss/);
  });

  it('when the middle panel has no diagonal, then the count is short by one and the open panel B–C–G–F is named', () => {
    const r = importOf(dxf(parallelChordTruss({ panels: 3, a: 3, h: 2, skipDiagonal: 1 })));
    const e = entry(r, 'mechanism')!;
    expect(e.severity).toBe('warning');
    // m = 12, j = 8: 12 + 3 = 15 < 16 (the count rule m + r ≥ 2j, from memory)
    expect(e.message).toMatch(/^likely a mechanism before any load is placed: m \+ r = 12 \+ 3 = 15 is less than 2j = 16, taking r = 3 reactions \(a pin and a roller, as for a simply supported truss\), so it is short of 1 member; /);
    expect([...e.jointTags!].sort()).toEqual(['B', 'C', 'F', 'G']);
    expect(e.message).toMatch(/the panel [BCFG]–[BCFG]–[BCFG]–[BCFG] has four sides and no diagonal; a member from [BCFG] to [BCFG] makes the truss rigid/);
    expect([...e.memberTags!].sort()).toEqual(['BC', 'BF', 'CG', 'FG']);
  });

  it('when a cross-braced panel makes up the count but the middle panel is open, then the dependence is told and the panel named', () => {
    // left panel braced both ways (the braces cross without a joint), middle open: m = 13, m + r = 16 = 2j
    const r = importOf(dxf([...parallelChordTruss({ panels: 3, a: 3, h: 2, skipDiagonal: 1 }), line(0, 2, 3, 0, 'WEBS')]));
    expect(r.members).toHaveLength(13);
    const e = entry(r, 'mechanism')!;
    expect(e.severity).toBe('warning');
    expect(e.message).toMatch(/the count m \+ r = 16 ≥ 2j = 16 is met, but the joint equilibrium equations are dependent \(rank 15 < 16\)/);
    expect([...e.jointTags!].sort()).toEqual(['B', 'C', 'F', 'G']);
  });
});

describe('the mechanism check on a large drawing', () => {
  it(`when a drawing has more than ${MECHANISM_RANK_MAX_JOINTS} joints, then only the count is checked`, () => {
    // a chain of n + 1 joints and n members: m + r = n + 3 < 2(n + 1) (count rule, from memory)
    const n = MECHANISM_RANK_MAX_JOINTS + 10;
    const joints = Array.from({ length: n + 1 }, (_, i) => ({ id: `j${i + 1}`, tag: `J${i + 1}`, x: i, y: 0 }));
    const members = Array.from({ length: n }, (_, i) => ({ id: `m${i + 1}`, tag: `M${i + 1}`, from: `j${i + 1}`, to: `j${i + 2}` }));
    const found = mechanismCheck(joints, members)!;
    expect(found.severity).toBe('warning');
    expect(found.message).toBe(
      `likely a mechanism before any load is placed: m + r = ${n} + 3 = ${n + 3} is less than 2j = ${2 * (n + 1)}, taking r = 3 reactions (a pin and a roller, as for a simply supported truss), so it is short of ${n - 1} members; add the missing members (a diagonal in each open panel) or check the supports it will have`,
    );
    expect(found.joints).toEqual([]);
  });
});

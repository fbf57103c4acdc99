// @vitest-environment jsdom
import { describe, expect, it } from 'vitest';
import type { DxfMember, DxfReportEntry } from '@shared/dxf-import';
import type { Joint } from '@shared/model/truss';
import { reportEntryHasPlaces, reportEntryHighlight } from './report-highlight';
import { formatScaleLength, scaleBarLength } from './scale-bar';
import { parseTolerance, toleranceInUnit, toleranceUnitFor } from './units';

// An invented 4 m × 1 m panel: j1 (0,0), j2 (4,0), j3 (4,1), j4 (0,1).
const joints: Joint[] = [
  { id: 'j1', tag: 'A', x: 0, y: 0 },
  { id: 'j2', tag: 'B', x: 4, y: 0 },
  { id: 'j3', tag: 'C', x: 4, y: 1 },
  { id: 'j4', tag: 'D', x: 0, y: 1 },
];
const members: DxfMember[] = [
  { id: 'm1', tag: 'AB', from: 'j1', to: 'j2', layer: 'CHORDS' },
  { id: 'm2', tag: 'AC', from: 'j1', to: 'j3', layer: 'WEBS' },
  { id: 'm3', tag: 'BD', from: 'j2', to: 'j4', layer: 'WEBS' },
];

function entry(over: Partial<DxfReportEntry>): DxfReportEntry {
  return { kind: 'crossing', severity: 'warning', count: 1, message: 'm', points: [], joints: [], members: [], ...over };
}

describe('report entry → drawing highlight', () => {
  it('when an entry names a crossing point and its two members, then both members are marked and the box spans their four end joints', () => {
    const h = reportEntryHighlight(entry({ points: [{ x: 2, y: 0.5 }], members: ['m2', 'm3'] }), { joints, members })!;
    expect([...h.memberIds]).toEqual(['m2', 'm3']);
    expect(h.points).toEqual([{ x: 2, y: 0.5 }]);
    expect(h.jointIds.size).toBe(0);
    expect(h.box).toEqual({ minX: 0, minY: 0, maxX: 4, maxY: 1 });
  });

  it('when an entry names joints only, then the joints are marked and the box is theirs', () => {
    const h = reportEntryHighlight(entry({ kind: 'dangling-member', joints: ['j3'] }), { joints, members })!;
    expect([...h.jointIds]).toEqual(['j3']);
    expect(h.box).toEqual({ minX: 4, minY: 1, maxX: 4, maxY: 1 });
  });

  it('when an entry names ids the model does not hold (an older import), then they are skipped', () => {
    const h = reportEntryHighlight(entry({ joints: ['j9'], members: ['m1', 'm42'] }), { joints, members })!;
    expect([...h.memberIds]).toEqual(['m1']);
    expect(h.jointIds.size).toBe(0);
    expect(h.box).toEqual({ minX: 0, minY: 0, maxX: 4, maxY: 0 });
  });

  it('when an entry only says what was read, then it has no places and no highlight', () => {
    const e = entry({ kind: 'units', severity: 'info' });
    expect(reportEntryHasPlaces(e)).toBe(false);
    expect(reportEntryHighlight(e, { joints, members })).toBeNull();
  });

  it('when every named place is unknown or not finite, then there is no highlight', () => {
    expect(reportEntryHighlight(entry({ points: [{ x: Number.NaN, y: 1 }], joints: ['j99'] }), { joints, members })).toBeNull();
  });
});

describe('scale bar and tolerance units', () => {
  it('when 60 px/m and at most 140 px, then the bar is 2 m = 120 px (1-2-5 series)', () => {
    expect(scaleBarLength(60, 140)).toEqual({ metres: 2, pixels: 120 });
  });

  it('when 2000 px/m, then the bar is 50 mm = 100 px and is written in mm', () => {
    const bar = scaleBarLength(2000, 140);
    expect(bar.metres).toBeCloseTo(0.05, 12);
    expect(bar.pixels).toBeCloseTo(100, 9);
    expect(formatScaleLength(bar.metres)).toBe('50 mm');
  });

  it('when a tolerance of 0.5 mm is typed for an SI project, then 0.0005 m is stored; for US, 0.02 in is 0.000508 m (1 in = 25.4 mm exactly)', () => {
    expect(parseTolerance('0,5', toleranceUnitFor('SI'))).toBeCloseTo(0.0005, 15);
    expect(parseTolerance('0.02', toleranceUnitFor('US'))).toBeCloseTo(0.000508, 15);
    expect(toleranceInUnit(0.0254, toleranceUnitFor('US'))).toBe(1);
  });

  it('when the tolerance field is empty, then the default is used; when it is 0 or text, then it is refused as NaN', () => {
    expect(parseTolerance('  ', toleranceUnitFor('SI'))).toBeUndefined();
    expect(parseTolerance('0', toleranceUnitFor('SI'))).toBeNaN();
    expect(parseTolerance('one', toleranceUnitFor('SI'))).toBeNaN();
  });
});

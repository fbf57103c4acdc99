import { describe, expect, it } from 'vitest';
import { roofLoadsChanges, roofLoadsProblem, sameJointLoads } from './roof-loads';
import type { LoadCase } from './truss';

const snow = (loads: LoadCase['loads'], marked = true): LoadCase => ({ id: 'S', name: 'Snow', category: 'snow', loads, ...(marked ? { source: 'roof-loading' as const } : {}) });

describe('roof-takeoff loads', () => {
  // Expected values are sums and counts of the loads written out here (arithmetic, no source needed).
  it('when loads on the same joints add up to the same fx and fy, then they are the same; a changed value or joint is not', () => {
    const a = [{ joint: 'a', fx: 0, fy: -2 }, { joint: 'b', fx: 0, fy: -3 }];
    expect(sameJointLoads(a, [{ joint: 'b', fx: 0, fy: -3 }, { joint: 'a', fx: 0, fy: -1 }, { joint: 'a', fx: 0, fy: -1 }])).toBe(true);
    expect(sameJointLoads(a, [{ joint: 'a', fx: 0, fy: -2 }, { joint: 'b', fx: 0, fy: -3.001 }])).toBe(false);
    expect(sameJointLoads(a, [{ joint: 'a', fx: 0, fy: -2 }, { joint: 'c', fx: 0, fy: -3 }])).toBe(false);
  });

  it('when a save keeps the takeoff loads, then there is no problem; an edit, a dropped mark or a case the takeoff does not write is named', () => {
    const computed = { S: [{ joint: 'a', fx: 0, fy: -10.27 }] };
    expect(roofLoadsProblem([snow([])], [snow(computed.S)], computed)).toBeNull();
    expect(roofLoadsProblem([snow([])], [snow([{ joint: 'a', fx: 0, fy: -99 }])], computed)?.code).toBe('roof-loads-edited');
    expect(roofLoadsProblem([snow(computed.S)], [snow([{ joint: 'a', fx: 0, fy: -99 }], false)], computed)?.code).toBe('roof-loads-detach-first');
    // Removing the takeoff in the same save leaves its cases as hand loads.
    expect(roofLoadsProblem([snow(computed.S)], [snow(computed.S, false)], null, true)).toBeNull();
    expect(roofLoadsProblem([], [snow(computed.S)], null)?.code).toBe('roof-loads-without-takeoff');
  });

  it('when the roof loading writes a case with loads and one without, then the change says replaced and added with counts and totals', () => {
    const cases: LoadCase[] = [snow([{ joint: 'a', fx: 0, fy: -99 }], false), { id: 'D', name: 'Dead', category: 'dead', loads: [] }];
    const changes = roofLoadsChanges(cases, {
      S: [{ joint: 'a', fx: 0, fy: -4 }, { joint: 'b', fx: 0, fy: -6 }],
      D: [{ joint: 'a', fx: 0, fy: -1.5 }],
    });
    expect(changes).toEqual([
      { caseId: 'S', kind: 'replaced', before: { count: 1, totalFy: -99 }, after: { count: 2, totalFy: -10 } },
      { caseId: 'D', kind: 'added', before: { count: 0, totalFy: 0 }, after: { count: 1, totalFy: -1.5 } },
    ]);
    expect(roofLoadsChanges(cases, { S: [{ joint: 'a', fx: 0, fy: -99 }] })[0]!.kind).toBe('unchanged');
  });
});

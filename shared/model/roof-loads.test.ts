import { describe, expect, it } from 'vitest';
import { roofLoadsChanges, roofLoadsProblem, roofLoadsResolve, roofLoadsSteps, sameJointLoads } from './roof-loads';
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

describe('the one rule for roof-loading loads (app runs, job file, command line, import)', () => {
  // Common practice, no source: the loads a case holds are the loads solved; the values below are written out here.
  const computed = { S: [{ joint: 'a', fx: 0, fy: -4 }], D: [{ joint: 'a', fx: 0, fy: -1.5 }] };
  const dead = (loads: LoadCase['loads']): LoadCase => ({ id: 'D', name: 'Dead', category: 'dead', loads });

  it('when a case is marked, then it holds the roof loading\'s loads (filled in when left out); an unmarked case the roof loading writes keeps its hand loads', () => {
    const r = roofLoadsResolve([snow([]), dead([{ joint: 'b', fx: 0, fy: -7 }])], computed);
    expect(r.problem).toBeNull();
    expect(r.cases!.map((c) => c.loads)).toEqual([[{ joint: 'a', fx: 0, fy: -4 }], [{ joint: 'b', fx: 0, fy: -7 }]]);
    // Given and equal: kept as given (same object).
    const same = snow([{ joint: 'a', fx: 0, fy: -4 }]);
    expect(roofLoadsResolve([same], computed).cases![0]).toBe(same);
  });

  it('when a marked case differs, is not written by the roof loading, or there is no roof loading, then the problem names the case', () => {
    expect(roofLoadsResolve([snow([{ joint: 'a', fx: 0, fy: -4.5 }])], computed).problem).toEqual({ code: 'roof-loads-differ', caseId: 'S' });
    expect(roofLoadsResolve([snow([])], { D: computed.D }).problem).toEqual({ code: 'roof-loads-not-written', caseId: 'S' });
    expect(roofLoadsResolve([snow([])], null).problem).toEqual({ code: 'roof-loads-without-takeoff', caseId: 'S' });
    expect(roofLoadsResolve([dead([])], null).problem).toBeNull();
  });
});

describe('the roof loading steps a sheet prints', () => {
  it('when a case the roof loading writes is detached, then its steps are left out; shared steps and marked cases\' steps stay, in order', () => {
    const steps = [{ id: 'w', caseId: '' }, { id: 'd1', caseId: 'D' }, { id: 's1', caseId: 'S' }, { id: 'd2', caseId: 'D' }, { id: 's2', caseId: 'S' }];
    const cases = [{ id: 'D' }, { id: 'S', source: 'roof-loading' as const }];
    expect(roofLoadsSteps(steps, cases).map((s) => s.id)).toEqual(['w', 's1', 's2']);
  });
});

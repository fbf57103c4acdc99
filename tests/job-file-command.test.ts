import { execFile } from 'node:child_process';
import { mkdtempSync, writeFileSync } from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { promisify } from 'node:util';
import { describe, expect, it } from 'vitest';

const exec = promisify(execFile);
const root = path.resolve(__dirname, '..');
const dir = mkdtempSync(path.join(os.tmpdir(), 'panelpoint-jobs-'));

async function solve(job: unknown): Promise<{ code: number; stdout: string; stderr: string }> {
  const file = path.join(dir, `job-${Math.random().toString(36).slice(2)}.json`);
  writeFileSync(file, JSON.stringify(job));
  try {
    const { stdout, stderr } = await exec(process.execPath, ['--import', 'tsx', 'scripts/solve.ts', file], { cwd: root });
    return { code: 0, stdout, stderr };
  } catch (e) {
    const err = e as { code: number; stdout: string; stderr: string };
    return { code: err.code, stdout: err.stdout, stderr: err.stderr };
  }
}

// King-post truss, span 8 m, rise 3 m (joints A 0,0 — B 8,0 — C 4,3 — D 4,0): P at the apex gives
// rafters −(P/2)/sin θ = −5P/6 (method of joints by hand, sin θ = 3/5).
const king = {
  joints: [[0, 0], [8, 0], [4, 3], [4, 0]],
  members: [[0, 2], [2, 1], [0, 3], [3, 1], [2, 3]],
  supports: [{ at: [0, 0], type: 'pin' }, { at: [8, 0], type: 'roller' }],
  cases: [
    { id: 'D', name: 'Roofing', category: 'dead' },
    { id: 'S', name: 'Snow', category: 'snow' },
  ],
  loads: [
    { at: [4, 3], fy: -100, case: 'D' },
    { at: [4, 3], fy: -50, case: 'S' },
  ],
};

describe('job file on the command line', () => {
  it('when the job names cases and "asce7-16-strength", then 1.2D + 1.6S is formed (ASCE/SEI 7-16 §2.3.1 (3)) and governs the rafter', async () => {
    const { code, stdout } = await solve({ ...king, combinationSet: 'asce7-16-strength' });
    expect(code).toBe(0);
    const out = JSON.parse(stdout);
    const names = Object.keys(out.combinations);
    const c3 = names.find((n) => out.combinations[n].factors.D === 1.2 && out.combinations[n].factors.S === 1.6)!;
    expect(out.combinations[c3].clause).toMatch(/2\.3\.1 \(3\)/);
    expect(out.combinations[c3].forces.AC).toBeCloseTo(-(5 / 6) * (1.2 * 100 + 1.6 * 50), 9);
    expect(out.envelope.find((e: { tag: string }) => e.tag === 'AC').maxCompressionCombo).toBe(c3);
    expect(out.reactionEnvelope[0]).toHaveProperty('ryMaxCombo');
  });

  it('when EA is given per member by end points, then each member gets its own and a missing one is named', async () => {
    const ends = [[[0, 0], [4, 3]], [[4, 3], [8, 0]], [[0, 0], [4, 0]], [[4, 0], [8, 0]], [[4, 3], [4, 0]]];
    const indeterminate = { ...king, supports: [{ at: [0, 0], type: 'pin' }, { at: [8, 0], type: 'pin' }] };
    const ok = await solve({ ...indeterminate, EA: ends.map(([from, to], k) => ({ from, to, EA: 1e5 * (k + 1) })) });
    expect(ok.code).toBe(0);
    expect(JSON.parse(ok.stdout).classification.kind).toBe('indeterminate');
    const short = await solve({ ...indeterminate, EA: ends.slice(1).map(([from, to]) => ({ from, to, EA: 1e5 })) });
    expect(short.code).toBe(2);
    expect(short.stderr).toMatch(/missing-stiffness: .*AC/);
  });

  it('when a toggle is 1 mm from flat, then the classification says near a mechanism with 1/σmin and its middle joint', async () => {
    const { code, stdout } = await solve({ joints: [[0, 0], [3, 0.001], [6, 0]], members: [[0, 1], [1, 2]], supports: [{ at: [0, 0], type: 'pin' }, { at: [6, 0], type: 'pin' }], loads: [{ at: [3, 0.001], fy: -1 }] });
    expect(code).toBe(0);
    const out = JSON.parse(stdout);
    // Statics: N = −P/(2 sin θ), θ = atan(0.001/3).
    expect(out.cases.D.forces.AB).toBeCloseTo(-1 / (2 * Math.sin(Math.atan2(0.001, 3))), 6);
    expect(out.classification.conditioning).toMatchObject({ nearMechanism: true, joints: ['B'] });
    expect(out.classification.conditioning.amplification).toBeGreaterThan(2900);
  });

  const bad: [string, unknown, RegExp][] = [
    ['a case used in loads but not declared', { ...king, cases: [king.cases[0]] }, /load case "S", which "cases" does not declare/],
    ['a case declared twice', { ...king, cases: [...king.cases, king.cases[0]] }, /declares load case "D" twice/],
    ['an unknown category', { ...king, cases: [king.cases[0], { id: 'S', name: 'Snow', category: 'ice' }] }, /category "ice"; use one of/],
    ['an unknown set id', { ...king, combinationSet: 'en1990-6.11' }, /"combinationSet" is "en1990-6.11", which is not a combination set/],
    ['a combination naming a missing case', { ...king, combinations: [{ name: 'C9', factors: { W: 1 } }] }, /Combination "C9" has a factor on load case "W"/],
    ['a set without cases', { ...king, cases: undefined, combinationSet: 'asce7-16-asd' }, /"combinationSet" needs "cases"/],
    ['an EA entry on no member', { ...king, EA: [{ from: [0, 0], to: [8, 0], EA: 1 }] }, /no member joins those joints/],
    ['a wind coefficient without a velocity pressure', { ...king, cases: [...king.cases, { id: 'W', name: 'Wind', category: 'wind' }], takeoff: { topChordJoints: ['A', 'C', 'B'], areaLoads: [], wind: { caseId: 'W', windward: 'left', cWindward: -0.9, cLeeward: -0.5 }, spacing: 5, trussCount: 3, trussIndex: 1, method: 'exact' } }, /In "takeoff": A wind pressure coefficient is given without a velocity pressure q/],
    ['a partial-loading request for a dead case', { ...king, takeoff: { topChordJoints: ['A', 'C', 'B'], areaLoads: [{ caseId: 'D', q: 1, basis: 'plan', patterns: true }], spacing: 5, trussCount: 3, trussIndex: 1, method: 'exact' } }, /Load case "D" is a dead case, and span patterns are checked only for roof live, live and snow load/],
    ['a roof loading on a case not declared', { ...king, takeoff: { topChordJoints: ['A', 'C', 'B'], areaLoads: [{ caseId: 'Lr', q: 1, basis: 'plan' }], spacing: 5, trussCount: 3, trussIndex: 1, method: 'exact' } }, /In "takeoff": The roof loading writes load case "Lr"/],
  ];
  for (const [what, job, message] of bad) {
    it(`when the job has ${what}, then it exits 2 with one line on stderr and nothing on stdout`, async () => {
      const { code, stdout, stderr } = await solve(job);
      expect(code).toBe(2);
      expect(stdout).toBe('');
      expect(stderr.trim().split('\n')).toHaveLength(1);
      expect(stderr).toMatch(message);
    });
  }
});

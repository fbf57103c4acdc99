import { execFile } from 'node:child_process';
import path from 'node:path';
import { promisify } from 'node:util';
import { describe, expect, it } from 'vitest';

const run = promisify(execFile);
const root = path.resolve(__dirname, '..');
const job = (name: string) => path.join('tests', 'fixtures', 'jobs', name);

async function solve(name: string): Promise<{ code: number; stdout: string; stderr: string }> {
  try {
    const { stdout, stderr } = await run(process.execPath, ['--import', 'tsx', 'scripts/solve.ts', job(name)], { cwd: root });
    return { code: 0, stdout, stderr };
  } catch (e) {
    const err = e as { code: number; stdout: string; stderr: string };
    return { code: err.code, stdout: err.stdout, stderr: err.stderr };
  }
}

type Out = {
  classification: { kind: string; degree: number; joints: string[] };
  joints: { tag: string; x: number; y: number }[];
  members: { tag: string; from: [number, number]; to: [number, number] }[];
  cases: Record<string, { forces: Record<string, number>; reactions: { at: [number, number]; rx: number; ry: number }[]; zeroForce: string[]; residual: number; steps: { id: string; kind: string }[] }>;
  combinations: Record<string, { forces: Record<string, number>; reactions: { at: [number, number]; rx: number; ry: number }[] }>;
  reactionEnvelope: { joint: string; at: [number, number]; rxMax: number; rxMin: number; ryMax: number; ryMin: number; ryMaxCombo: string; ryMinCombo: string; uplift: string | null }[];
};

/** Member tag by its end points (order-free), so tests do not depend on tag order. */
function tagBetween(out: Out, p: [number, number], q: [number, number]): string {
  const same = (a: [number, number], b: [number, number]) => Math.abs(a[0] - b[0]) < 1e-9 && Math.abs(a[1] - b[1]) < 1e-9;
  const m = out.members.find((mb) => (same(mb.from, p) && same(mb.to, q)) || (same(mb.from, q) && same(mb.to, p)));
  if (!m) throw new Error(`no member between ${p} and ${q}`);
  return m.tag;
}

// King-post truss, span 8 m, rise 3 m: P at the apex gives rafters −(P/2)/sin θ = −5P/6 and
// tie (P/2)·cot θ = 2P/3 (method of joints by hand); a load at the tie joint goes up the king
// post to the apex, so the rafters and tie see the sum of both loads.
describe('npm run solve', () => {
  it('when the job gives inline joints, members, two load cases and a combination, then stdout is one JSON result with forces, reactions, zero-force members and steps', async () => {
    const { code, stdout, stderr } = await solve('king-post-inline.json');
    expect(code).toBe(0);
    expect(stderr).toBe('');
    expect(stdout.trim().split('\n')).toHaveLength(1);
    const out = JSON.parse(stdout) as Out;
    expect(out.classification).toMatchObject({ kind: 'determinate', degree: 0, joints: [] });
    const D = out.cases.D;
    expect(D.forces.AC).toBeCloseTo((-5 * 100) / 6, 9);
    expect(D.forces.AD).toBeCloseTo((2 * 100) / 3, 9);
    expect(D.zeroForce).toEqual(['CD']);
    expect(D.reactions.find((r) => r.at[0] === 0)!.ry).toBeCloseTo(50, 9);
    expect(D.residual).toBeLessThanOrEqual(1e-9 * 100);
    expect(D.steps.map((s) => s.kind)).toContain('joint');
    expect(D.steps.every((s) => /^[A-Za-z0-9_/-]+$/.test(s.id))).toBe(true);
    const S = out.cases.S;
    expect(S.forces.CD).toBeCloseTo(10, 9);
    expect(S.forces.AC).toBeCloseTo((-5 * (40 + 10)) / 6, 9);
    expect(out.combinations.C1.forces.AC).toBeCloseTo(1.2 * ((-5 * 100) / 6) + 1.6 * ((-5 * 50) / 6), 9);
    expect(out.combinations.C1.forces.CD).toBeCloseTo(1.6 * 10, 9);
    // Reaction envelope over the one combination: symmetric loads, so each support takes half
    // (statics by hand): D 100/2 = 50, S (40 + 10)/2 = 25, C1 = 1.2·50 + 1.6·25 = 100 kN up, no uplift.
    expect(out.reactionEnvelope.map((r) => r.at)).toEqual([[0, 0], [8, 0]]);
    for (const r of out.reactionEnvelope) {
      expect(r.ryMax).toBeCloseTo(100, 9);
      expect(r.ryMin).toBeCloseTo(100, 9);
      expect([r.ryMaxCombo, r.ryMinCombo]).toEqual(['C1', 'C1']);
      expect(Math.abs(r.rxMax) + Math.abs(r.rxMin)).toBeLessThan(1e-9);
      expect(r.uplift).toBeNull();
    }
    expect(out.reactionEnvelope[0].joint).toBe(out.joints.find((j) => j.x === 0 && j.y === 0)!.tag);
  });

  it('when the job names a DXF drawn in millimetres, then the drawing import gives the geometry in metres and the forces match', async () => {
    const { code, stdout } = await solve('king-post-drawing.json');
    expect(code).toBe(0);
    const out = JSON.parse(stdout) as Out;
    expect(out.joints).toHaveLength(4);
    expect(out.members).toHaveLength(5); // the line on layer NOTES is not a member
    const f = out.cases.D.forces;
    expect(f[tagBetween(out, [0, 0], [4, 3])]).toBeCloseTo(-500 / 6, 9);
    expect(f[tagBetween(out, [0, 0], [4, 0])]).toBeCloseTo(200 / 3, 9);
    expect(f[tagBetween(out, [4, 3], [4, 0])]).toBeCloseTo(0, 12);
  });

  it('when all reactions are parallel, then the command exits 0 with an unstable classification naming the joints and no cases', async () => {
    const { code, stdout } = await solve('unstable-parallel.json');
    expect(code).toBe(0);
    const out = JSON.parse(stdout) as Out;
    expect(out.classification.kind).toBe('unstable');
    expect(out.classification.joints.sort()).toEqual(['A', 'B', 'C', 'D']);
    expect(out.cases).toEqual({});
  });

  it('when the truss is indeterminate and EA is given, then the forces match the unit-load method for a braced square', async () => {
    // Square 4 m × 4 m, both diagonals, P = 25 kN horizontal at the top-left joint, equal EA:
    // sides ±P/2, diagonals ±P/√2 (compatibility of the redundant diagonal, worked by hand).
    const { code, stdout } = await solve('indeterminate-ea.json');
    expect(code).toBe(0);
    const out = JSON.parse(stdout) as Out;
    expect(out.classification).toMatchObject({ kind: 'indeterminate', degree: 1 });
    const f = out.cases.W.forces;
    const P = 25;
    expect(f.AB).toBeCloseTo(P / 2, 9);
    expect(f.BC).toBeCloseTo(-P / 2, 9);
    expect(f.AC).toBeCloseTo(P / Math.SQRT2, 9);
    expect(f.BD).toBeCloseTo(-P / Math.SQRT2, 9);
  });

  const bad: [string, RegExp][] = [
    ['bad-load-off-joint.json', /load of case D at \[4\.5, 3\] m is not at a joint/],
    ['bad-two-supports.json', /duplicate-support: Joint B has two supports/],
    ['bad-zero-length.json', /zero-length-member: Member DE/],
    ['bad-no-supports.json', /no-supports/],
    ['bad-missing-ea.json', /missing-stiffness: .*members AC, CB, AD, DB, CD/],
    ['bad-infinite.json', /loads\.0\.fy/],
    ['bad-nan.json', /joints\.2\.1/],
    ['bad-missing-drawing.json', /Cannot read the drawing missing\.dxf/],
    ['bad-not-json.json', /not valid JSON/],
  ];
  for (const [file, message] of bad) {
    it(`when the job is ${file.replace(/\.json$/, '')}, then it exits 2 with one line on stderr and nothing on stdout`, async () => {
      const { code, stdout, stderr } = await solve(file);
      expect(code).toBe(2);
      expect(stdout).toBe('');
      expect(stderr.trim().split('\n')).toHaveLength(1);
      expect(stderr).toMatch(message);
    });
  }
});

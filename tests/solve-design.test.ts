import { execFile } from 'node:child_process';
import path from 'node:path';
import { promisify } from 'node:util';
import { describe, expect, it } from 'vitest';

const run = promisify(execFile);
const root = path.resolve(__dirname, '..');

async function solve(name: string): Promise<{ code: number; stdout: string; stderr: string }> {
  try {
    const { stdout, stderr } = await run(process.execPath, ['--import', 'tsx', 'scripts/solve.ts', path.join('tests', 'fixtures', 'jobs', name)], { cwd: root });
    return { code: 0, stdout, stderr };
  } catch (e) {
    const err = e as { code: number; stdout: string; stderr: string };
    return { code: err.code, stdout: err.stdout, stderr: err.stderr };
  }
}

// MPa per ksi from the exact definitions of the pound-force and the inch (NIST SP 811):
// 1 kip = 4448.2216152605 N over 1 in² = 645.16 mm². A992 is 50 ksi, E 29 000 ksi (AISC 360-16).
const KSI = 4448.2216152605 / 645.16;
// King-post truss, span 8 m, rise 3 m, 100 kN at the apex; A = 1000 mm², A992 (E 29 000 ksi).
describe('npm run solve with "design" and "deflection"', () => {
  it('when the job has design groups and a deflection request, then stdout adds "design" and "deflection" arrays', async () => {
    const r = await solve('design-king-post.json');
    expect(r.code).toBe(0);
    const out = JSON.parse(r.stdout);
    // Unit-load method by hand (2 × 1.736111 + 2 × 0.888889 mm at E = 200 000 MPa): 21/4 mm down at the apex, × 200 000/E.
    expect(out.deflection).toHaveLength(1);
    expect(out.deflection[0].dy).toBeCloseTo((-5.25 * 200_000) / (29_000 * KSI), 9);
    expect(out.deflection[0].ratio).toBeCloseTo((5.25 * 200_000) / (29_000 * KSI) / (8000 / 240), 9);
    // Rafter under U1 = 1.4 × 100 kN: N = −1.4 × 5P/6; AISC 360-16 E3 by hand, Lc/r = 5000/40 = 125 (elastic, E3-3).
    const Fe = (Math.PI ** 2 * 29_000 * KSI) / 125 ** 2;
    const phiPn = (0.9 * 0.877 * Fe * 1000) / 1000;
    const raf = out.design.find((d: { member: string }) => d.member === 'AC');
    expect(raf.governing).toBe('U1');
    expect(raf.utilisation).toBeCloseTo((1.4 * 500) / 6 / phiPn, 6);
    expect(raf.pass).toBe(false);
    expect(raf.checks.map((c: { clause: string }) => c.clause)).toContain('AISC 360-16 E1');
    expect(raf.steps.compression.length).toBeGreaterThan(3);
  });

  it.each([
    // The Design tab's own sentences (shared/model/design-input.ts, shared/design/basis.ts).
    ['design-bad-section.json', /The section of design group “group 1” \(design\.groups\.0\): the area A must be greater than 0\./],
    ['design-missing-section.json', /Members CB, AD, DB, CD are in no design group; add a group that takes them/],
  ])('when %s is bad, then exit 2 with one sentence', async (name, message) => {
    const r = await solve(name);
    expect(r.code).toBe(2);
    expect(r.stdout).toBe('');
    expect(r.stderr.trim().split('\n')).toHaveLength(1);
    expect(r.stderr).toMatch(message);
  });
});

import { lusolve, matrix } from 'mathjs';
import { describe, expect, it } from 'vitest';
import type { TrussModel } from '@shared/model/truss';
import { SolverError } from './errors';
import { trussSolve } from './solve';
import { modelFromSketch } from './test-trusses';

describe('statically indeterminate trusses by the direct stiffness method', () => {
  it('when three equal bars hang from pins and carry P at their common joint, then the forces match the classic compatibility result', () => {
    // Closed form (compatibility of a symmetric three-bar hanger, e.g. Timoshenko, Strength of
    // Materials, Part I, statically indeterminate problems): centre bar P/(1 + 2cos³α), side
    // bars P·cos²α/(1 + 2cos³α), α = angle of the side bars from the vertical, equal EA.
    const h = 3;
    const s = 2.2;
    const P = 60;
    const r = trussSolve(
      modelFromSketch({
        joints: [['A', -s, h], ['B', 0, h], ['C', s, h], ['D', 0, 0]],
        members: [['A', 'D'], ['B', 'D'], ['C', 'D']],
        supports: [{ at: 'A', kind: 'pin' }, { at: 'B', kind: 'pin' }, { at: 'C', kind: 'pin' }],
        cases: [{ id: 'D', loads: [['D', 0, -P]] }],
        EA: 2.1e5,
      }),
    );
    expect([r.classification.kind, r.classification.degree]).toEqual(['indeterminate', 1]);
    const cos = h / Math.hypot(s, h);
    const c = r.cases[0];
    expect(c.method).toBe('stiffness');
    expect(c.forces.BD).toBeCloseTo(P / (1 + 2 * cos ** 3), 9);
    expect(c.forces.AD).toBeCloseTo((P * cos ** 2) / (1 + 2 * cos ** 3), 9);
    expect(c.forces.CD).toBeCloseTo((P * cos ** 2) / (1 + 2 * cos ** 3), 9);
    expect(c.residual).toBeLessThanOrEqual(1e-9 * P);
    const kinds = c.stiffnessSteps.map((st) => st.kind);
    expect(kinds).toEqual(['stiffness-members', 'stiffness-assembly', 'stiffness-displacements', 'stiffness-forces']);
  });

  it('when a square panel with both diagonals takes a horizontal load at the top, then the redundant diagonal matches the unit-load (compatibility) method', () => {
    // Unit-load method (virtual work), equal EA: X = −Σ N0·n·L / Σ n²·L with the hand-derived
    // primary forces N0 (diagonal BD cut) and unit-tension forces n in BD.
    const a = 4;
    const P = 25;
    const r2 = Math.SQRT2;
    const L: Record<string, number> = { AB: a, BC: a, CD: a, DA: a, AC: a * r2, BD: a * r2 };
    const N0: Record<string, number> = { AB: 0, BC: -P, CD: -P, DA: 0, AC: r2 * P, BD: 0 };
    const n: Record<string, number> = { AB: -1 / r2, BC: -1 / r2, CD: -1 / r2, DA: -1 / r2, AC: 1, BD: 1 };
    let num = 0;
    let den = 0;
    for (const k of Object.keys(L)) {
      num += N0[k] * n[k] * L[k];
      den += n[k] * n[k] * L[k];
    }
    const X = -num / den;
    const result = trussSolve(
      modelFromSketch({
        joints: [['A', 0, 0], ['B', a, 0], ['C', a, a], ['D', 0, a]],
        members: [['A', 'B'], ['B', 'C'], ['C', 'D'], ['D', 'A'], ['A', 'C'], ['B', 'D']],
        supports: [{ at: 'A', kind: 'pin' }, { at: 'B', kind: 'roller' }],
        cases: [{ id: 'W', loads: [['D', P, 0]] }],
        EA: 5e4,
      }),
    );
    const f = result.cases[0].forces;
    for (const k of Object.keys(L)) expect(f[k]).toBeCloseTo(N0[k] + X * n[k], 9);
    expect(result.cases[0].residual).toBeLessThanOrEqual(1e-9 * P);
  });

  it('when random redundant trusses are solved, then forces match mathjs solving equilibrium, compatibility and support conditions together', () => {
    // Mixed formulation, independent of the stiffness method: unknowns N (m), R (r), joint
    // displacements d (2j); equations: joint equilibrium, N·L/EA = û·(d_b − d_a), d·n = 0 at each
    // reaction. Solved by mathjs lusolve.
    let seed = 7;
    const rand = () => {
      seed = (seed * 16807) % 2147483647;
      return seed / 2147483647;
    };
    for (let t = 0; t < 25; t++) {
      const panels = 2 + Math.floor(rand() * 4);
      const joints: [string, number, number][] = [];
      const members: [string, string][] = [];
      for (let i = 0; i <= panels; i++) joints.push([`L${i}`, i * 2 + rand() * 0.4, rand() * 0.3], [`U${i}`, i * 2 + rand() * 0.4, 2 + rand()]);
      for (let i = 0; i < panels; i++) members.push([`L${i}`, `L${i + 1}`], [`U${i}`, `U${i + 1}`], [`U${i}`, `L${i + 1}`], [`L${i}`, `U${i + 1}`]);
      for (let i = 0; i <= panels; i++) members.push([`L${i}`, `U${i}`]);
      const model: TrussModel = modelFromSketch({
        joints,
        members,
        supports: [{ at: 'L0', kind: 'pin' }, { at: `L${panels}`, kind: rand() < 0.5 ? 'pin' : 'roller' }],
        cases: [{ id: 'D', loads: joints.filter(() => rand() < 0.6).map(([j]) => [j, (rand() - 0.5) * 20, -rand() * 30]) }],
      });
      model.members.forEach((mb) => {
        mb.EA = 1e4 * (1 + 9 * rand());
      });
      const result = trussSolve(model);
      expect(result.classification.kind).toBe('indeterminate');
      const idx = new Map(model.joints.map((j, i) => [j.id, i]));
      const m = model.members.length;
      const rdirs: { j: number; dx: number; dy: number }[] = [];
      for (const sp of model.supports) {
        const j = idx.get(sp.joint)!;
        if (sp.kind === 'pin') rdirs.push({ j, dx: 1, dy: 0 }, { j, dx: 0, dy: 1 });
        else rdirs.push({ j, dx: 0, dy: 1 });
      }
      const r = rdirs.length;
      const nj = model.joints.length;
      const size = m + r + 2 * nj;
      const A = Array.from({ length: size }, () => new Array(size).fill(0));
      const b = new Array(size).fill(0);
      model.members.forEach((mb, e) => {
        const a = idx.get(mb.from)!;
        const c = idx.get(mb.to)!;
        const dx = model.joints[c].x - model.joints[a].x;
        const dy = model.joints[c].y - model.joints[a].y;
        const len = Math.hypot(dx, dy);
        const ux = dx / len;
        const uy = dy / len;
        A[2 * a][e] += ux;
        A[2 * a + 1][e] += uy;
        A[2 * c][e] -= ux;
        A[2 * c + 1][e] -= uy;
        const row = 2 * nj + e;
        A[row][e] = len / (mb.EA as number);
        A[row][m + r + 2 * c] -= ux;
        A[row][m + r + 2 * c + 1] -= uy;
        A[row][m + r + 2 * a] += ux;
        A[row][m + r + 2 * a + 1] += uy;
      });
      rdirs.forEach((rd, k) => {
        A[2 * rd.j][m + k] += rd.dx;
        A[2 * rd.j + 1][m + k] += rd.dy;
        const row = 2 * nj + m + k;
        A[row][m + r + 2 * rd.j] = rd.dx;
        A[row][m + r + 2 * rd.j + 1] = rd.dy;
      });
      for (const ld of model.loadCases[0].loads) {
        const j = idx.get(ld.joint)!;
        b[2 * j] -= ld.fx;
        b[2 * j + 1] -= ld.fy;
      }
      const x = (lusolve(matrix(A), b) as unknown as { toArray(): number[][] }).toArray().map((row) => row[0]);
      const scale = Math.max(1, ...x.slice(0, m).map(Math.abs));
      model.members.forEach((mb, e) => {
        expect(Math.abs(result.cases[0].forces[mb.id] - x[e]), `truss ${t} member ${mb.id}`).toBeLessThan(1e-8 * scale);
      });
      const largest = Math.max(1e-12, ...model.loadCases[0].loads.map((l) => Math.hypot(l.fx, l.fy)));
      expect(result.cases[0].residual).toBeLessThanOrEqual(1e-9 * largest);
    }
  });

  it('when an indeterminate truss has members without E and A, then a missing-stiffness error names them', () => {
    const model = modelFromSketch({
      joints: [['A', 0, 0], ['B', 8, 0], ['C', 4, 3], ['D', 4, 0]],
      members: [['A', 'C'], ['C', 'B'], ['A', 'D'], ['D', 'B'], ['C', 'D']],
      supports: [{ at: 'A', kind: 'pin' }, { at: 'B', kind: 'pin' }],
      cases: [{ id: 'D', loads: [['C', 0, -10]] }],
    });
    model.members[0].E = 2e8;
    model.members[0].A = 1e-3;
    model.members[1].EA = 2e5;
    const err = (() => {
      try {
        trussSolve(model);
      } catch (e) {
        return e;
      }
      return null;
    })();
    expect(err).toBeInstanceOf(SolverError);
    expect((err as SolverError).code).toBe('missing-stiffness');
    expect((err as SolverError).message).toMatch(/members AD, DB, CD have no E and A/);
    expect((err as SolverError).ids).toEqual(['AD', 'DB', 'CD']);
  });
});

import type { Combination, TrussModel } from '@shared/model/truss';

/** Compact truss description for tests and benchmarks (joint ids = tags). */
export interface TrussSketch {
  joints: [string, number, number][];
  members: [string, string][];
  supports: ({ at: string; kind: 'pin' } | { at: string; kind: 'roller'; angleDeg?: number })[];
  cases?: { id: string; loads: [string, number, number][] }[];
  combinations?: Combination[];
  /** kN, given to every member. */
  EA?: number;
}

/** Builds a TrussModel from a sketch; member ids and tags are the two joint tags ("AB"). */
export function modelFromSketch(s: TrussSketch): TrussModel {
  return {
    joints: s.joints.map(([tag, x, y]) => ({ id: tag, tag, x, y })),
    members: s.members.map(([a, b]) => ({ id: `${a}${b}`, tag: `${a}${b}`, from: a, to: b, ...(s.EA ? { EA: s.EA } : {}) })),
    supports: s.supports.map((sp) =>
      sp.kind === 'pin' ? { joint: sp.at, kind: 'pin' as const } : { joint: sp.at, kind: 'roller' as const, angleDeg: sp.angleDeg ?? 90 },
    ),
    loadCases: (s.cases ?? []).map((c) => ({
      id: c.id,
      name: c.id,
      category: 'other' as const,
      loads: c.loads.map(([joint, fx, fy]) => ({ joint, fx, fy })),
    })),
    combinations: s.combinations ?? [],
  };
}

/**
 * Parallel-chord truss of n panels (n even), panel a, depth h: bottom joints L0…Ln, top joints
 * U0…Un, chords, verticals (end posts included) and one diagonal per panel; pin at L0, roller at
 * Ln; load P (kN, downward) at L1…L(n−1). Pratt: left-half diagonals U_k→L_{k+1}; Howe:
 * L_k→U_{k+1}; mirrored on the right.
 */
export function parallelChordSketch(web: 'pratt' | 'howe', n: number, a: number, h: number, P: number): TrussSketch {
  const joints: [string, number, number][] = [];
  for (let i = 0; i <= n; i++) joints.push([`L${i}`, i * a, 0], [`U${i}`, i * a, h]);
  const members: [string, string][] = [];
  for (let i = 0; i < n; i++) members.push([`L${i}`, `L${i + 1}`], [`U${i}`, `U${i + 1}`]);
  for (let i = 0; i <= n; i++) members.push([`U${i}`, `L${i}`]);
  for (let k = 0; k < n; k++) {
    const left = k < n / 2;
    if (web === 'pratt') members.push(left ? [`U${k}`, `L${k + 1}`] : [`L${k}`, `U${k + 1}`]);
    else members.push(left ? [`L${k}`, `U${k + 1}`] : [`U${k}`, `L${k + 1}`]);
  }
  const loads: [string, number, number][] = [];
  for (let i = 1; i < n; i++) loads.push([`L${i}`, 0, -P]);
  return {
    joints,
    members,
    supports: [{ at: 'L0', kind: 'pin' }, { at: `L${n}`, kind: 'roller' }],
    cases: [{ id: 'D', loads }],
  };
}

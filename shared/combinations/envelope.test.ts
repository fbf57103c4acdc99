import { describe, expect, it } from 'vitest';
import type { LoadCategory, TrussModel } from '@shared/model/truss';
import { trussSolve } from '@shared/solver';
import { combinationsBuild, type CombinationSetId } from './index';

/**
 * The member envelope over the built combinations against a brute force over every presence
 * pattern of the standards' equations, written out here from the clause text (independently of
 * sets.ts): each variable term is present with its factor or absent, each "or" takes each option,
 * and under EN 1990 the whole permanent action takes γ_G,sup or γ_G,inf.
 *
 * Invented scenario: a 12 m pitched Howe roof truss, rise 2 m, with dead load, snow and a wind
 * case that lifts the roof (suction normal to both slopes, resolved into x and y by hand).
 */
const theta = Math.atan2(1, 3); // slope of each rafter: 1 m rise per 3 m
const suction = (p: number, side: 'left' | 'right'): [number, number] => [
  // outward normal of the left slope is (−sin θ, cos θ), of the right slope (sin θ, cos θ)
  (side === 'left' ? -1 : 1) * p * Math.sin(theta),
  p * Math.cos(theta),
];

function pitchedTruss(): TrussModel {
  const joints: [string, number, number][] = [
    ['L0', 0, 0], ['L1', 3, 0], ['L2', 6, 0], ['L3', 9, 0], ['L4', 12, 0],
    ['U1', 3, 1], ['U2', 6, 2], ['U3', 9, 1],
  ];
  const members: [string, string][] = [
    ['L0', 'L1'], ['L1', 'L2'], ['L2', 'L3'], ['L3', 'L4'],
    ['L0', 'U1'], ['U1', 'U2'], ['U2', 'U3'], ['U3', 'L4'],
    ['U1', 'L1'], ['U2', 'L2'], ['U3', 'L3'], ['U1', 'L2'], ['U3', 'L2'],
  ];
  const load = (joint: string, fx: number, fy: number) => ({ joint, fx, fy });
  const [wlx, wly] = suction(7, 'left');
  const [wrx, wry] = suction(4, 'right');
  const cases: { id: string; category: LoadCategory; loads: ReturnType<typeof load>[] }[] = [
    { id: 'D', category: 'dead', loads: [load('L0', 0, -2), load('U1', 0, -4), load('U2', 0, -4), load('U3', 0, -4), load('L4', 0, -2)] },
    // unbalanced snow: heavier on the right slope
    { id: 'S', category: 'snow', loads: [load('L0', 0, -1), load('U1', 0, -3), load('U2', 0, -5), load('U3', 0, -6), load('L4', 0, -3)] },
    { id: 'W', category: 'wind', loads: [load('U1', wlx, wly), load('U2', (wlx + wrx) / 2, (wly + wry) / 2), load('U3', wrx, wry)] },
  ];
  return {
    joints: joints.map(([tag, x, y]) => ({ id: tag, tag, x, y })),
    members: members.map(([a, b]) => ({ id: `${a}${b}`, tag: `${a}${b}`, from: a, to: b })),
    supports: [{ joint: 'L0', kind: 'pin' }, { joint: 'L4', kind: 'roller', angleDeg: 90 }],
    loadCases: cases.map((c) => ({ ...c, name: c.id })),
    combinations: [],
  };
}

type Cat = 'D' | 'L' | 'Lr' | 'S' | 'W';
/** An equation: factors the permanent action may take, then groups of "one of these or none". */
interface Equation {
  dead: number[];
  groups: [Cat, number][][];
}
// ASCE/SEI 7-16 §2.3.1 (1)–(5)
const LRFD: Equation[] = [
  { dead: [1.4], groups: [] },
  { dead: [1.2], groups: [[['L', 1.6]], [['Lr', 0.5], ['S', 0.5]]] },
  { dead: [1.2], groups: [[['Lr', 1.6], ['S', 1.6]], [['L', 1], ['W', 0.5]]] },
  { dead: [1.2], groups: [[['W', 1]], [['L', 1]], [['Lr', 0.5], ['S', 0.5]]] },
  { dead: [0.9], groups: [[['W', 1]]] },
];
// ASCE/SEI 7-16 §2.4.1 (1)–(7)
const ASD: Equation[] = [
  { dead: [1], groups: [] },
  { dead: [1], groups: [[['L', 1]]] },
  { dead: [1], groups: [[['Lr', 1], ['S', 1]]] },
  { dead: [1], groups: [[['L', 0.75]], [['Lr', 0.75], ['S', 0.75]]] },
  { dead: [1], groups: [[['W', 0.6]]] },
  { dead: [1], groups: [[['L', 0.75]], [['W', 0.45]], [['Lr', 0.75], ['S', 0.75]]] },
  { dead: [0.6], groups: [[['W', 0.6]]] },
];
// EN 1990 eq. (6.10) / (6.10a) / (6.10b), Table A1.2(B) (γ_G 1.35/1.00, γ_Q 1.5, ξ 0.85),
// Table A1.1 ψ0 (snow 0.5, wind 0.6); roof imposed load not with snow or wind (EN 1991-1-1 §3.3.2(1)).
const psi0: Record<'S' | 'W', number> = { S: 0.5, W: 0.6 };
const leads = (dead: number[]): Equation[] =>
  (['S', 'W'] as const).map((lead) => ({
    dead,
    groups: [[[lead, 1.5]], ...(['S', 'W'] as const).filter((o) => o !== lead).map((o) => [[o, 1.5 * psi0[o]]] as [Cat, number][])],
  }));
const EN610: Equation[] = [{ dead: [1.35, 1], groups: [] }, ...leads([1.35, 1])];
const EN610AB: Equation[] = [
  { dead: [1.35, 1], groups: [[['S', 0.75]], [['W', 0.9]]] },
  ...leads([0.85 * 1.35, 1]),
];

/** Every factor set of the equations: each group takes one option or none (principal too). */
function everyPattern(equations: Equation[]): Record<string, number>[] {
  const out: Record<string, number>[] = [];
  for (const eq of equations) {
    let sets: [Cat, number][][] = [[]];
    for (const group of eq.groups) sets = sets.flatMap((s) => [s, ...group.map((o) => [...s, o])]);
    for (const d of eq.dead) for (const s of sets) out.push(Object.fromEntries([['D', d], ...s]));
  }
  return out;
}

function envelope(forces: Record<string, Record<string, number>>, factorSets: Record<string, number>[]) {
  const members = Object.keys(forces.D);
  return Object.fromEntries(
    members.map((m) => {
      const values = factorSets.map((f) => Object.entries(f).reduce((t, [c, k]) => t + k * (forces[c]?.[m] ?? 0), 0));
      return [m, { tension: Math.max(0, ...values), compression: Math.min(0, ...values) }];
    }),
  );
}

describe('member envelope against every presence pattern (dead, snow, wind uplift on a pitched truss)', () => {
  const model = pitchedTruss();
  const solved = trussSolve(model);
  const forces = Object.fromEntries(solved.cases.map((c) => [c.caseId, c.forces]));
  const table: [CombinationSetId, Equation[]][] = [
    ['asce7-16-strength', LRFD],
    ['asce7-16-asd', ASD],
    ['en1990-6.10', EN610],
    ['en1990-6.10ab', EN610AB],
  ];

  it('when the wind case is resolved normal to the slopes, then its components match a hand resolution', () => {
    // 7 kN suction on the left slope, θ = atan(1/3): x = −7 sin θ = −2.2136, y = 7 cos θ = 6.6408.
    expect(suction(7, 'left')[0]).toBeCloseTo(-7 / Math.sqrt(10), 12);
    expect(suction(7, 'left')[1]).toBeCloseTo(21 / Math.sqrt(10), 12);
  });

  it.each(table)('when %s is built, then the solver envelope equals the brute force to 1e-9 kN', (setId, equations) => {
    const combos = combinationsBuild(setId, model.loadCases);
    const brute = envelope(forces, everyPattern(equations));
    const withCombos = trussSolve({ ...model, combinations: combos.map((c) => ({ name: c.name, factors: c.factors, clause: c.clause })) });
    expect(withCombos.envelopeSource).toBe('combinations');
    for (const row of withCombos.envelope) {
      expect(row.maxTension).toBeCloseTo(brute[row.member].tension, 9);
      expect(row.maxCompression).toBeCloseTo(brute[row.member].compression, 9);
    }
  });

  it('when every variable load is always present (the old rule), then the LRFD and EN envelopes come out low', () => {
    // The patterns with every load of each equation present, as the builder formed them before
    // (with its one favourable-permanent EN combination 1.0G + 1.5W). ASD had D + S in (3) already.
    for (const [setId, equations] of table.filter(([id]) => id !== 'asce7-16-asd')) {
      const allPresent = equations.flatMap((eq) => {
        let sets: [Cat, number][][] = [[]];
        for (const group of eq.groups) {
          const present = group.filter(([c]) => c in forces);
          if (present.length > 0) sets = sets.flatMap((s) => present.map((o) => [...s, o]));
        }
        return [eq.dead[0]].flatMap((d) => sets.map((s) => Object.fromEntries([['D', d], ...s])));
      });
      if (setId.startsWith('en')) allPresent.push({ D: 1, W: 1.5 });
      const old = envelope(forces, allPresent);
      const full = envelope(forces, everyPattern(equations));
      const worst = Math.max(
        ...Object.keys(full).map((m) => {
          const a = Math.max(full[m].tension, -full[m].compression);
          const b = Math.max(old[m].tension, -old[m].compression);
          return a > 0 ? (a - b) / a : 0;
        }),
      );
      expect(worst, setId).toBeGreaterThan(0.01);
      if (process.env.SHOW_FIGURES) console.log(setId, `old envelope low by ${(worst * 100).toFixed(1)} %`);
    }
  });
});

describe('reaction envelope against statics by hand (pin L0, roller L4, span 12 m)', () => {
  const model = pitchedTruss();
  const at = new Map(model.joints.map((j) => [j.id, j]));
  /** Reactions of one load case from ΣM about L0, ΣFy and ΣFx (closed-form statics). */
  const statics = (caseId: string) => {
    const loads = model.loadCases.find((c) => c.id === caseId)!.loads;
    const fx = loads.reduce((t, l) => t + l.fx, 0);
    const fy = loads.reduce((t, l) => t + l.fy, 0);
    // ΣM about L0 (counter-clockwise +): Σ(x·fy − y·fx) + 12·R4 = 0
    const m = loads.reduce((t, l) => t + at.get(l.joint)!.x * l.fy - at.get(l.joint)!.y * l.fx, 0);
    const r4 = -m / 12;
    return { L0: { rx: -fx, ry: -fy - r4 }, L4: { rx: 0, ry: r4 } };
  };

  it('when the LRFD combinations are solved, then each support max/min equals the hand statics over every presence pattern, and uplift is said in words', () => {
    const combos = combinationsBuild('asce7-16-strength', model.loadCases);
    const analysis = trussSolve({ ...model, combinations: combos.map((c) => ({ name: c.name, factors: c.factors })) });
    const byCase = Object.fromEntries(['D', 'S', 'W'].map((id) => [id, statics(id)]));
    const patterns = everyPattern(LRFD);
    for (const joint of ['L0', 'L4'] as const) {
      const ry = patterns.map((f) => Object.entries(f).reduce((t, [c, k]) => t + k * (byCase[c]?.[joint].ry ?? 0), 0));
      const rx = patterns.map((f) => Object.entries(f).reduce((t, [c, k]) => t + k * (byCase[c]?.[joint].rx ?? 0), 0));
      const row = analysis.reactionEnvelope!.find((r) => r.joint === joint)!;
      expect(row.ryMax).toBeCloseTo(Math.max(...ry), 9);
      expect(row.ryMin).toBeCloseTo(Math.min(...ry), 9);
      expect(row.rxMax).toBeCloseTo(Math.max(...rx), 9);
      expect(row.rxMin).toBeCloseTo(Math.min(...rx), 9);
      if (Math.min(...ry) < 0) expect(row.uplift).toMatch(new RegExp(`^Support ${joint} is lifted under LRFD 5`));
      else expect(row.uplift).toBeNull();
    }
    // Dead load alone: 16 kN shared equally by symmetry, 1.4 × 8 = 11.2 kN is not the max (snow adds).
    expect(statics('D').L0.ry).toBeCloseTo(8, 12);
  });
});

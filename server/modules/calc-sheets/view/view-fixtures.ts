import type { TrussModel } from '@shared/model/truss';
import { trussSolve } from '@shared/solver';
import { modelFromSketch } from '@shared/solver/test-trusses';
import type { CalcSheetInput } from './types';

/**
 * Small trusses for the section tests, each with its closed form beside it, and a formatter
 * written here from the sheet's printed rule (fixed decimals, U+2212 for minus, + for tension
 * where signed) rather than taken from the code under test. Used by view/**\/*.test.ts only.
 */

/** The sheet's printed rule for a number: `d` decimals, U+2212 minus, optional + sign; zero unsigned. */
export function printed(value: number, decimals: number, signed = false): string {
  const digits = Math.abs(value).toFixed(decimals);
  if (Number(digits) === 0) return digits;
  if (value < 0) return `\u2212${digits}`;
  return signed ? `+${digits}` : digits;
}

/** 1 ft = 0.3048 m and 1 lbf = 4.4482216152605 N, exact by definition (NIST SP 811, appendix B). */
export const M_PER_FT = 0.3048;
export const KN_PER_KIP = 4.4482216152605;

/**
 * A 3-4-5 triangle: A (0, 0) pin, B (L, 0) roller, apex C (L/2, h); span L = 8 m, rise h = 3 m,
 * so each rafter is 5 m long and sin θ = 3/5, cos θ = 4/5. Case D: P = 12 kN down at C. Case W:
 * H = 4 kN to the right at C.
 *
 * Closed forms by the method of joints and global equilibrium (any statics text, e.g. Hibbeler,
 * Engineering Mechanics: Statics, ch. 6 — from memory):
 *   D: R_A = R_B = P/2; rafters AC = BC = −P/(2 sin θ) = −10; tie AB = +P/(2 tan θ) = +8.
 *   W: R_Ax = −H; R_By = +H·h/L, R_Ay = −H·h/L (moments about A); joint B gives
 *      BC = −(H·h/L)/sin θ = −2.5 and AB = −BC·cos θ = +2; joint C gives AC = +2.5.
 */
export const TRIANGLE = { L: 8, h: 3, P: 12, H: 4 } as const;
const sinT = TRIANGLE.h / Math.hypot(TRIANGLE.L / 2, TRIANGLE.h);
const cosT = TRIANGLE.L / 2 / Math.hypot(TRIANGLE.L / 2, TRIANGLE.h);
export const TRIANGLE_FORCES = {
  D: { AB: TRIANGLE.P / (2 * (sinT / cosT)), AC: -TRIANGLE.P / (2 * sinT), BC: -TRIANGLE.P / (2 * sinT) },
  W: (() => {
    const RBy = (TRIANGLE.H * TRIANGLE.h) / TRIANGLE.L;
    const BC = -RBy / sinT;
    return { AB: -BC * cosT, AC: -BC, BC };
  })(),
};
export const TRIANGLE_REACTIONS = {
  D: { A: { rx: 0, ry: TRIANGLE.P / 2 }, B: { rx: 0, ry: TRIANGLE.P / 2 } },
  W: { A: { rx: -TRIANGLE.H, ry: -(TRIANGLE.H * TRIANGLE.h) / TRIANGLE.L }, B: { rx: 0, ry: (TRIANGLE.H * TRIANGLE.h) / TRIANGLE.L } },
};

export function triangleModel(cases: ('D' | 'W')[] = ['D'], combinations: TrussModel['combinations'] = []): TrussModel {
  const { L, h, P, H } = TRIANGLE;
  const model = modelFromSketch({
    joints: [['A', 0, 0], ['B', L, 0], ['C', L / 2, h]],
    members: [['A', 'B'], ['A', 'C'], ['B', 'C']],
    supports: [{ at: 'A', kind: 'pin' }, { at: 'B', kind: 'roller' }],
    cases: cases.map((id) => ({ id, loads: id === 'D' ? [['C', 0, -P]] : [['C', H, 0]] })),
    combinations,
  });
  for (const c of model.loadCases) {
    c.name = c.id === 'D' ? 'Roofing and framing' : 'Wind from the west';
    c.category = c.id === 'D' ? 'dead' : 'wind';
  }
  return model;
}

/**
 * The triangle with a joint M at mid-span of the tie and a post MC. At M the two tie halves are
 * collinear and M is unloaded, so the post carries nothing (zero-force member rule for three
 * members, two collinear, e.g. Hibbeler, Statics §6.3 — from memory).
 */
export function postedTriangleModel(): TrussModel {
  const { L, h, P } = TRIANGLE;
  return modelFromSketch({
    joints: [['A', 0, 0], ['M', L / 2, 0], ['B', L, 0], ['C', L / 2, h]],
    members: [['A', 'M'], ['M', 'B'], ['M', 'C'], ['A', 'C'], ['B', 'C']],
    supports: [{ at: 'A', kind: 'pin' }, { at: 'B', kind: 'roller' }],
    cases: [{ id: 'D', loads: [['C', 0, -P]] }],
  });
}

/**
 * Three equal bars hanging from pins A, B, C to a joint D that carries P: statically
 * indeterminate to degree 1 (m + r = 3 + 6 = 9 > 2j = 8). Compatibility closed form (e.g.
 * Timoshenko, Strength of Materials, Part I, statically indeterminate problems — from memory):
 * centre bar P/(1 + 2cos³α), side bars P·cos²α/(1 + 2cos³α), α from the vertical, equal EA.
 */
export const HANGER = { h: 3, s: 2.2, P: 60, EA: 2.1e5 } as const;
export function hangerModel(): TrussModel {
  const { h, s, P, EA } = HANGER;
  return modelFromSketch({
    joints: [['A', -s, h], ['B', 0, h], ['C', s, h], ['D', 0, 0]],
    members: [['A', 'D'], ['B', 'D'], ['C', 'D']],
    supports: [{ at: 'A', kind: 'pin' }, { at: 'B', kind: 'pin' }, { at: 'C', kind: 'pin' }],
    cases: [{ id: 'D', loads: [['D', 0, -P]] }],
    EA,
  });
}
export function hangerForces() {
  const { h, s, P } = HANGER;
  const cos = h / Math.hypot(s, h);
  const d = 1 + 2 * cos ** 3;
  return { AD: (P * cos ** 2) / d, BD: P / d, CD: (P * cos ** 2) / d };
}

/** A square panel without a diagonal: m + r = 4 + 3 = 7 < 2j = 8, a mechanism by count alone. */
export function openPanelModel(): TrussModel {
  return modelFromSketch({
    joints: [['A', 0, 0], ['B', 4, 0], ['C', 4, 3], ['D', 0, 3]],
    members: [['A', 'B'], ['B', 'C'], ['C', 'D'], ['D', 'A']],
    supports: [{ at: 'A', kind: 'pin' }, { at: 'B', kind: 'roller' }],
    cases: [{ id: 'W', loads: [['D', 5, 0]] }],
  });
}

/**
 * A toggle: two 3 m chords between two pins, the middle joint 1 mm above the line of the pins.
 * 1 kN at the middle gives P/(2 sin θ) ≈ 1 500 kN of compression in each chord (statics).
 */
export function toggleModel(): TrussModel {
  return modelFromSketch({
    joints: [['A', 0, 0], ['B', 3, 0.001], ['C', 6, 0]],
    members: [['A', 'B'], ['B', 'C']],
    supports: [{ at: 'A', kind: 'pin' }, { at: 'C', kind: 'pin' }],
    cases: [{ id: 'D', loads: [['B', 0, -1]] }],
  });
}

/** A sheet input for a model, solved by the real solver; the rest invented for the tests. */
export function sheetInput(model: TrussModel, overrides: Partial<CalcSheetInput> = {}): CalcSheetInput {
  return {
    firm: { name: 'Orchard Lane Engineers (demo)', address: '12 Mill Row\nUpper Dale', paperSize: 'A4' },
    project: { name: 'Fenwick depot — canopy', jobNumber: 'OL-0912', unitSystem: 'SI' },
    trussName: 'CT1',
    subject: 'Canopy truss CT1',
    revision: 'B',
    model,
    analysis: trussSolve(model),
    generatedAt: '2026-05-14T08:41:30Z',
    ...overrides,
  };
}

/** Text of KaTeX HTML with tags and KaTeX's hidden MathML dropped, for reading the numbers. */
export function katexText(html: string): string {
  return html
    .replace(/<annotation[\s\S]*?<\/annotation>/g, '')
    .replace(/<span class="katex-mathml">[\s\S]*?<\/math><\/span>/g, '')
    .replace(/<[^>]+>/g, '')
    .replace(/&[a-z]+;|&#\d+;/g, ' ');
}

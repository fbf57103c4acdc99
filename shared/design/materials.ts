import { unitConvert } from '@shared/units';
import { DesignError } from './errors';

/**
 * Materials for the axial member checks. Units: MPa (N/mm²).
 *
 * Steel grades are preset from their published minimum values; timber reference design values
 * are always entered by the engineer, who owns them (Panelpoint ships no timber grade tables).
 */

export interface SteelMaterial {
  kind: 'steel';
  /** Yield stress, MPa. */
  Fy: number;
  /** Tensile strength, MPa. */
  Fu: number;
  /** Modulus of elasticity, MPa. */
  E: number;
  /** The grade name when preset. */
  grade?: string;
  /** Where the preset values come from. */
  source?: string;
}

/**
 * Timber values as the engineer gives them (MPa). Ft and Fc are adjusted design values: the
 * reference value times every applicable adjustment factor except Cp (NDS 2018 Table 4.3.1 and
 * §3.7.1: Fc* is Fc with all factors except Cp). Emin is E′min (adjusted). c per NDS §3.7.1:
 * 0.8 sawn lumber, 0.85 round poles and piles, 0.9 glued laminated timber or SCL.
 */
export interface TimberMaterial {
  kind: 'timber';
  Ft: number;
  Fc: number;
  Emin: number;
  /** Modulus of elasticity for deflection, MPa. */
  E: number;
  c: number;
  name?: string;
}

export type Material = SteelMaterial | TimberMaterial;

/** ksi → MPa with the exact factor (1 lbf = 4.4482216152605 N, 1 in = 25.4 mm; shared/units). */
const ksi = (v: number): number => unitConvert(v, 'ksi', 'MPa');

/**
 * Preset steel grades: minimum Fy and Fu for the thinnest product range of each standard. The
 * ASTM grades are specified in ksi and used with AISC 360-16, whose E is 29 000 ksi: they are
 * held as those ksi values converted exactly (A992: Fy = 50 ksi = 344.74 MPa, not the rounded
 * 345 MPa of the metric edition — the lower, conservative reading, and the value a US project
 * prints as 50 ksi). The EN grades are specified in MPa.
 */
export const STEEL_GRADES: Record<string, SteelMaterial> = {
  A36: { kind: 'steel', grade: 'A36', Fy: ksi(36), Fu: ksi(58), E: ksi(29_000), source: 'ASTM A36: Fy 36 ksi, Fu 58 ksi; E 29 000 ksi per AISC 360-16 symbols list (from memory)' },
  A992: { kind: 'steel', grade: 'A992', Fy: ksi(50), Fu: ksi(65), E: ksi(29_000), source: 'ASTM A992: Fy 50 ksi, Fu 65 ksi (from memory; AISC Manual Table 2-4); E 29 000 ksi' },
  'A500-C': { kind: 'steel', grade: 'A500 Gr C', Fy: ksi(46), Fu: ksi(62), E: ksi(29_000), source: 'ASTM A500 Grade C round HSS: Fy 46 ksi, Fu 62 ksi (from memory; AISC Manual Table 2-4); rectangular HSS to A500-18 have Fy 50 ksi — enter Fy for those; E 29 000 ksi' },
  S235: { kind: 'steel', grade: 'S235', Fy: 235, Fu: 360, E: 210_000, source: 'EN 10025-2 via EN 1993-1-1 Table 3.1, t ≤ 40 mm: fy 235 MPa, fu 360 MPa; E 210 000 MPa (§3.2.6) (from memory)' },
  S275: { kind: 'steel', grade: 'S275', Fy: 275, Fu: 430, E: 210_000, source: 'EN 10025-2 via EN 1993-1-1 Table 3.1, t ≤ 40 mm: fy 275 MPa, fu 430 MPa; E 210 000 MPa (§3.2.6) (from memory)' },
  S355: { kind: 'steel', grade: 'S355', Fy: 355, Fu: 490, E: 210_000, source: 'EN 10025-2 via EN 1993-1-1 Table 3.1, t ≤ 40 mm: fy 355 MPa, fu 490 MPa; E 210 000 MPa (§3.2.6) (from memory)' },
};

export function steelGrade(name: string): SteelMaterial {
  const key = Object.keys(STEEL_GRADES).find((k) => k.toLowerCase() === name.toLowerCase() || STEEL_GRADES[k].grade!.toLowerCase() === name.toLowerCase());
  if (!key) throw new DesignError('unknown-grade', `The steel grade "${name}" is not preset; use one of ${Object.keys(STEEL_GRADES).join(', ')} or give Fy, Fu and E.`);
  return { ...STEEL_GRADES[key] };
}

function positive(v: unknown, what: string): void {
  if (typeof v !== 'number' || !Number.isFinite(v) || v <= 0) throw new DesignError('bad-material', `${what} must be a positive number of MPa.`);
}

/** Checks a material's values; one sentence naming the first bad value. */
export function materialValidate(m: Material, where: string): void {
  if (m.kind === 'steel') {
    positive(m.Fy, `Fy of ${where}`);
    positive(m.Fu, `Fu of ${where}`);
    positive(m.E, `E of ${where}`);
    if (m.Fu < m.Fy) throw new DesignError('bad-material', `Fu of ${where} (${m.Fu} MPa) is below Fy (${m.Fy} MPa); check the grade values.`);
    return;
  }
  for (const k of ['Ft', 'Fc', 'Emin', 'E'] as const) {
    if (m[k] === undefined) throw new DesignError('missing-timber-values', `The timber of ${where} has no ${k}; enter the adjusted design values Ft, Fc (all factors except Cp), Emin, E and c.`);
    positive(m[k], `${k} of ${where}`);
  }
  if (!(m.c > 0 && m.c < 1)) throw new DesignError('bad-material', `c of ${where} must be between 0 and 1 (NDS §3.7.1: 0.8 sawn lumber, 0.85 poles, 0.9 glulam or SCL).`);
}

import type { DesignStandard } from './checks';

/**
 * The symbols the member-design steps print (shared/design/checks.ts), each with what it stands
 * for, per design basis: the sheet lists them on the member-design page, before the first group's
 * steps, so that every symbol is defined before its first use. Meanings follow the notation of
 * the standard named (AISC 360-16 Chapters D and E and Table B4.1a; EN 1993-1-1 6.2.3, 6.3.1;
 * NDS 2018 3.6.3, 3.7.1, 3.8.1); wording of our own.
 */
export interface DesignSymbol {
  symbol: string;
  meaning: string;
}

/** Every basis: the ratio lines under each check print |N| / capacity and slenderness / limit. */
const FORCE = { symbol: 'N, |N|', meaning: 'axial force of the member under the combination named (tension positive), and its size; a ratio line divides |N| by the available strength (the capacity) or the slenderness by its limit' };

const SLENDER_XY = [
  { symbol: 'Kx, Ky', meaning: 'effective-length factors in the plane of the truss (x) and out of it (y)' },
  { symbol: 'Lx, Ly', meaning: 'unbraced lengths in and out of the plane of the truss (the member length unless braced, out of plane the purlin or brace spacing)' },
];

const AISC: DesignSymbol[] = [
  FORCE,
  { symbol: 'Ag', meaning: 'gross area of the section (A of the section line)' },
  { symbol: 'An', meaning: 'net area of the section in tension' },
  { symbol: 'U', meaning: 'shear-lag factor (D3)' },
  { symbol: 'Ae', meaning: 'effective net area, An·U (D3)' },
  { symbol: 'Fy, Fu', meaning: 'specified minimum yield stress and tensile strength of the steel' },
  { symbol: 'E', meaning: 'modulus of elasticity of the steel' },
  { symbol: 'Pn', meaning: 'nominal axial strength (D2, E3)' },
  { symbol: 'φ, φPn', meaning: 'resistance factor (LRFD) and the design strength' },
  { symbol: 'Ω, Pn/Ω', meaning: 'safety factor (ASD) and the allowable strength' },
  { symbol: 'rx, ry', meaning: 'radii of gyration of the section about its axes in and out of the plane of the truss' },
  ...SLENDER_XY,
  { symbol: 'L/r', meaning: 'slenderness of a member in tension, the larger of Lx/rx and Ly/ry (D1 user note: 300 at most)' },
  { symbol: 'Lc/r', meaning: 'slenderness of a member in compression, Lc = K·L the effective length, the larger of Kx·Lx/rx and Ky·Ly/ry (E2 user note: 200 at most)' },
  { symbol: 'Fe', meaning: 'elastic buckling stress (E3-4)' },
  { symbol: 'Fcr', meaning: 'critical stress for flexural buckling (E3-2 or E3-3)' },
  { symbol: 'b/t, λr', meaning: 'width-to-thickness ratio of a section element and its limit for a nonslender element (Table B4.1a)' },
];

const EN: DesignSymbol[] = [
  FORCE,
  { symbol: 'A', meaning: 'gross cross-section area' },
  { symbol: 'Anet', meaning: 'net cross-section area in tension (6.2.2.2)' },
  { symbol: 'fy, fu', meaning: 'yield strength and ultimate tensile strength of the steel' },
  { symbol: 'E', meaning: 'modulus of elasticity of the steel' },
  { symbol: 'γM0, γM1, γM2', meaning: 'partial factors for the resistance of cross-sections, of members to instability and of net sections in tension (6.1; recommended values unless the National Annex says otherwise)' },
  { symbol: 'Npl,Rd, Nu,Rd', meaning: 'design plastic resistance of the gross section and design ultimate resistance of the net section in tension (6.2.3)' },
  { symbol: 'Nc,Rd', meaning: 'design resistance of the cross-section in compression (6.2.4)' },
  { symbol: 'ix, iy', meaning: 'radii of gyration of the section about its axes in and out of the plane of the truss' },
  ...SLENDER_XY,
  { symbol: 'Lcr/i', meaning: 'slenderness, Lcr = K·L the buckling length, the larger of Kx·Lx/ix and Ky·Ly/iy' },
  { symbol: 'λ1', meaning: 'slenderness at which the Euler stress equals fy, π·√(E/fy) (6.3.1.3)' },
  { symbol: 'λ̄', meaning: 'non-dimensional slenderness (6.50)' },
  { symbol: 'α', meaning: 'imperfection factor of the buckling curve (Table 6.1)' },
  { symbol: 'Φ', meaning: 'value to determine the reduction factor χ (6.49)' },
  { symbol: 'χ', meaning: 'reduction factor for flexural buckling (6.49)' },
  { symbol: 'Nb,Rd', meaning: 'design buckling resistance of the member in compression (6.47)' },
];

const NDS: DesignSymbol[] = [
  FORCE,
  { symbol: 'A, An', meaning: 'gross and net area of the section' },
  { symbol: 'Ft′', meaning: 'adjusted tension design value parallel to grain, entered by the engineer' },
  { symbol: 'T′', meaning: 'allowable tension on the net section, Ft′·An (3.8.1)' },
  { symbol: 'Fc*', meaning: 'compression design value parallel to grain multiplied by every adjustment factor except Cp, entered by the engineer' },
  { symbol: 'E′min', meaning: 'adjusted modulus of elasticity for stability, entered by the engineer' },
  { symbol: 'Ke', meaning: 'buckling length coefficient (3.7.1.2); Kx and Ky of the section line' },
  ...SLENDER_XY,
  { symbol: 'ℓe', meaning: 'effective column length, Ke·L' },
  { symbol: 'dx, dy', meaning: 'depths of the section in and out of the plane of the truss' },
  { symbol: 'ℓe/d', meaning: 'slenderness ratio, the larger of the two (3.7.1.4: 50 at most)' },
  { symbol: 'FcE', meaning: 'critical buckling design value for compression members (3.7.1)' },
  { symbol: 'c', meaning: 'the column factor of the material (3.7.1: 0.8 for sawn lumber, 0.9 for structural glued laminated timber and structural composite lumber; from memory of the clause)' },
  { symbol: 'Cp', meaning: 'column stability factor (3.7.1)' },
  { symbol: 'P′', meaning: 'allowable compression, Fc*·Cp·A (3.6.3)' },
];

/** The symbols a design basis's steps print, in the order a reader meets them. */
export function designSymbols(standard: DesignStandard): DesignSymbol[] {
  if (standard === 'en1993-1-1') return EN;
  if (standard === 'nds-2018-asd') return NDS;
  return AISC;
}

/**
 * What is left of a printed formula once the listed symbols, numbers, operators, notes in
 * brackets and the plain words of the ratio lines are taken out: the symbols it uses that the
 * list does not define (the sheet's tests expect none).
 */
export function undefinedIn(formula: string, symbols: DesignSymbol[]): string[] {
  const atoms = symbols.flatMap((s) => s.symbol.split(', ')).sort((a, b) => b.length - a.length);
  let rest = formula.replace(/\((Table [^)]*|curve [^)]*|\d[\d.]*\(\d\))\)/g, ' ');
  for (const a of atoms) rest = rest.split(a).join(' ');
  rest = rest.replace(/\b(max|capacity|slenderness|limit)\b|π|[\d.]+|[=·/+−\-()[\]{}²^√≤≥?:,\s]/g, ' ');
  return rest.split(/\s+/).filter(Boolean);
}

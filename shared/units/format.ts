import {
  UNIT_SYSTEMS,
  UnitError,
  unitFromBase,
  unitIsKnown,
  type Quantity,
  type Unit,
  type UnitSystemId,
} from './units';

/**
 * Fixed decimals per unit for tables and calc sheets: one precision per unit so a column of
 * numbers lines up, chosen so the last printed digit is meaningful for truss work
 * (common practice, no source).
 */
export const UNIT_DECIMALS: Readonly<Record<Unit, number>> = {
  m: 3,
  mm: 0,
  cm: 1,
  ft: 2,
  in: 2,
  kN: 2,
  N: 0,
  kip: 2,
  lbf: 0,
  kPa: 2,
  'kN/m²': 2,
  Pa: 0,
  MPa: 1,
  psf: 1,
  psi: 0,
  ksi: 2,
  ksf: 3,
  'kN/m': 2,
  'N/m': 0,
  plf: 0,
  klf: 3,
  'kN·m': 2,
  'kip·ft': 2,
  'lbf·ft': 0,
  'kip·in': 1,
};

/** U+2212, the typographic minus sign, so a negative number is as wide as a positive one. */
export const MINUS_SIGN = '\u2212';
/** U+202F narrow no-break space between a number and its unit. */
export const UNIT_SPACE = '\u202f';
/** U+2009 thin space used to group thousands when asked for. */
export const GROUP_SPACE = '\u2009';

export interface NumberFormatOptions {
  /** Group thousands with a thin space (default false). */
  group?: boolean;
  /** Write '+' before positive numbers (default false). */
  signed?: boolean;
  /** Use the ASCII hyphen-minus instead of U+2212 (for CSV and plain text; default false). */
  asciiMinus?: boolean;
}

/**
 * Writes a number with exactly `decimals` decimals (half away from zero), never "−0.00":
 * a value that rounds to zero is written without a sign.
 * @throws UnitError 'invalid-number' for NaN or ±∞ — a table never shows "NaN".
 */
export function numberFormat(value: number, decimals: number, options: NumberFormatOptions = {}): string {
  if (!Number.isFinite(value)) {
    throw new UnitError('invalid-number', `Cannot format ${value}: the value is not a finite number.`);
  }
  if (!Number.isInteger(decimals) || decimals < 0 || decimals > 12) {
    throw new UnitError('invalid-number', `Decimals must be a whole number from 0 to 12, got ${decimals}.`);
  }
  const magnitude = roundHalfAway(Math.abs(value), decimals);
  let digits = magnitude.toFixed(decimals);
  const isZero = Number(digits) === 0;
  if (options.group) {
    const [whole, fraction] = digits.split('.');
    const grouped = whole.replace(/\B(?=(\d{3})+(?!\d))/g, GROUP_SPACE);
    digits = fraction === undefined ? grouped : `${grouped}.${fraction}`;
  }
  if (isZero) return digits;
  if (value < 0) return (options.asciiMinus ? '-' : MINUS_SIGN) + digits;
  return options.signed ? `+${digits}` : digits;
}

function roundHalfAway(x: number, decimals: number): number {
  const f = 10 ** decimals;
  // Number.EPSILON scaled guards against 1.005 → 1.00 from binary representation.
  return Math.round(x * f * (1 + Number.EPSILON)) / f;
}

/**
 * Writes a value that is already in `unit` with that unit's fixed decimals and the unit,
 * e.g. unitFormat(4.5, 'kN/m') → "4.50 kN/m" (narrow no-break space before the unit).
 */
export function unitFormat(
  value: number,
  unit: Unit,
  options: NumberFormatOptions & { decimals?: number } = {},
): string {
  if (!unitIsKnown(unit)) {
    throw new UnitError('unknown-unit', `Unknown unit "${unit}".`);
  }
  const decimals = options.decimals ?? UNIT_DECIMALS[unit];
  return `${numberFormat(value, decimals, options)}${UNIT_SPACE}${unit}`;
}

/**
 * Converts a value from Panelpoint's computing unit (m, kN, kPa, kN/m, kN·m) into the display
 * unit of a project's unit system and writes it with its unit,
 * e.g. quantityFormat(0.9576, 'pressure', 'us') → "20.0 psf".
 */
export function quantityFormat(
  valueInBase: number,
  quantity: Quantity,
  system: UnitSystemId,
  options: NumberFormatOptions & { decimals?: number } = {},
): string {
  const unit = UNIT_SYSTEMS[system][quantity];
  return unitFormat(unitFromBase(valueInBase, unit), unit, options);
}

const SUPERSCRIPT: Readonly<Record<string, string>> = {
  '0': '⁰', '1': '¹', '2': '²', '3': '³', '4': '⁴', '5': '⁵', '6': '⁶', '7': '⁷', '8': '⁸', '9': '⁹', '-': '⁻',
};

/** The parts of a number written as m × 10ⁿ with `significant` significant figures (1 ≤ |m| < 10). */
export function powerOfTenParts(value: number, significant: number): { mantissa: number; exponent: number } {
  if (!Number.isFinite(value)) {
    throw new UnitError('invalid-number', `Cannot format ${value}: the value is not a finite number.`);
  }
  if (!Number.isInteger(significant) || significant < 1 || significant > 12) {
    throw new UnitError('invalid-number', `Significant figures must be a whole number from 1 to 12, got ${significant}.`);
  }
  if (value === 0) return { mantissa: 0, exponent: 0 };
  // toExponential rounds the mantissa and carries into the exponent (9.96e-5 → "1.0e-4").
  const [m, e] = value.toExponential(significant - 1).split('e');
  return { mantissa: Number(m), exponent: Number(e) };
}

/**
 * Writes a number as m × 10ⁿ with superscript figures and the typographic minus, the way an
 * engineer writes it by hand: scientificFormat(2.01e-14, 2) → "2.0 × 10⁻¹⁴" (never the
 * computer's "2.01e-14"). `significant` figures in the mantissa, trailing zeros kept so a
 * column lines up; 0 is written "0". With `asciiMinus`, for plain text, the mantissa's sign is
 * a hyphen-minus (the exponent keeps its superscript minus).
 */
export function scientificFormat(value: number, significant = 2, options: Pick<NumberFormatOptions, 'asciiMinus'> = {}): string {
  const { mantissa, exponent } = powerOfTenParts(value, significant);
  if (mantissa === 0) return '0';
  const m = numberFormat(mantissa, significant - 1, options);
  if (exponent === 0) return m;
  const e = String(exponent).split('').map((ch) => SUPERSCRIPT[ch]).join('');
  return `${m} × 10${e}`;
}

/** The same number for KaTeX: texScientific(2.01e-14, 2) → "2.0 \\times 10^{-14}". */
export function texScientific(value: number, significant = 2): string {
  const { mantissa, exponent } = powerOfTenParts(value, significant);
  if (mantissa === 0) return '0';
  const m = numberFormat(mantissa, significant - 1, { asciiMinus: true });
  return exponent === 0 ? m : `${m} \\times 10^{${exponent}}`;
}

/**
 * A number with `decimals` fixed decimals while that shows it (|v| ≥ 10⁻ᵈᵉᶜⁱᵐᵃˡˢ), and as
 * m × 10ⁿ with `significant` figures when fixed decimals would round it to nothing or when it
 * is 10⁶ or more: readableFormat(3.6e-15, 3) → "3.6 × 10⁻¹⁵", readableFormat(0.5, 3) → "0.500".
 */
export function readableFormat(value: number, decimals: number, significant = 2, options: NumberFormatOptions = {}): string {
  const a = Math.abs(value);
  if (value === 0 || (a >= 10 ** -decimals && a < 1e6)) return numberFormat(value, decimals, options);
  return scientificFormat(value, significant, options);
}

/**
 * A load factor with every digit it has (up to six decimals), no trailing zeros, the typographic
 * minus: factorFormat(1.1475) → "1.1475" (never 1.147 or 1.15), factorFormat(1.5) → "1.5",
 * factorFormat(1) → "1". A factor decides a design number, so it is never cut short.
 */
export function factorFormat(value: number, options: Pick<NumberFormatOptions, 'asciiMinus'> = {}): string {
  const text = numberFormat(value, 6, options);
  return text.includes('.') ? text.replace(/0+$/, '').replace(/\.$/, '') : text;
}

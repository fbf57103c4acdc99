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

/**
 * Unit conversion between SI and US customary units for the quantities a truss calc sheet
 * prints: length, force, pressure (area load and stress), line load and moment.
 *
 * Every factor is derived from the exact definitions of the international foot and pound
 * (1959 international yard and pound agreement; NIST SP 811, Appendix B):
 *   1 ft  = 0.3048 m (exact), 1 in = 0.0254 m (exact),
 *   1 lbf = 4.4482216152605 N (exact: 0.45359237 kg × 9.80665 m/s²),
 *   1 kip = 1000 lbf.
 * No factor is a rounded table value; rounding happens only when a number is formatted.
 *
 * Internal base units (what the rest of Panelpoint computes in): m, kN, kPa (= kN/m²),
 * kN/m, kN·m.
 */

/** Exact length of the international foot, m. */
export const FOOT_M = 0.3048;
/** Exact length of the international inch, m. */
export const INCH_M = FOOT_M / 12;
/** Exact pound-force, N (0.45359237 kg × standard gravity 9.80665 m/s²). */
export const POUND_FORCE_N = 4.4482216152605;
/** Exact kip (1000 lbf), N. */
export const KIP_N = 1000 * POUND_FORCE_N;

export type LengthUnit = 'm' | 'mm' | 'cm' | 'ft' | 'in';
export type ForceUnit = 'kN' | 'N' | 'kip' | 'lbf';
/** Area loads and stresses. 'kN/m²' is a synonym of 'kPa'. */
export type PressureUnit = 'kPa' | 'kN/m²' | 'Pa' | 'MPa' | 'psf' | 'psi' | 'ksi' | 'ksf';
export type LineLoadUnit = 'kN/m' | 'N/m' | 'plf' | 'klf';
export type MomentUnit = 'kN·m' | 'kip·ft' | 'lbf·ft' | 'kip·in';

export type Unit = LengthUnit | ForceUnit | PressureUnit | LineLoadUnit | MomentUnit;
export type Quantity = 'length' | 'force' | 'pressure' | 'line-load' | 'moment';

/** Thrown for an unknown unit or a conversion between different quantities. */
export class UnitError extends Error {
  readonly code: 'unknown-unit' | 'incompatible-units' | 'invalid-number';
  constructor(code: UnitError['code'], message: string) {
    super(message);
    this.name = 'UnitError';
    this.code = code;
  }
}

const KN = 1000; // N per kN
const SQ_FT_M2 = FOOT_M * FOOT_M;
const SQ_IN_M2 = INCH_M * INCH_M;

interface UnitDefinition {
  quantity: Quantity;
  /** How many base units (m, kN, kPa, kN/m, kN·m) one of this unit is. */
  toBase: number;
}

const UNIT_TABLE: Record<Unit, UnitDefinition> = {
  m: { quantity: 'length', toBase: 1 },
  mm: { quantity: 'length', toBase: 0.001 },
  cm: { quantity: 'length', toBase: 0.01 },
  ft: { quantity: 'length', toBase: FOOT_M },
  in: { quantity: 'length', toBase: INCH_M },

  kN: { quantity: 'force', toBase: 1 },
  N: { quantity: 'force', toBase: 1 / KN },
  kip: { quantity: 'force', toBase: KIP_N / KN },
  lbf: { quantity: 'force', toBase: POUND_FORCE_N / KN },

  kPa: { quantity: 'pressure', toBase: 1 },
  'kN/m²': { quantity: 'pressure', toBase: 1 },
  Pa: { quantity: 'pressure', toBase: 0.001 },
  MPa: { quantity: 'pressure', toBase: 1000 },
  psf: { quantity: 'pressure', toBase: POUND_FORCE_N / KN / SQ_FT_M2 },
  ksf: { quantity: 'pressure', toBase: KIP_N / KN / SQ_FT_M2 },
  psi: { quantity: 'pressure', toBase: POUND_FORCE_N / KN / SQ_IN_M2 },
  ksi: { quantity: 'pressure', toBase: KIP_N / KN / SQ_IN_M2 },

  'kN/m': { quantity: 'line-load', toBase: 1 },
  'N/m': { quantity: 'line-load', toBase: 1 / KN },
  plf: { quantity: 'line-load', toBase: POUND_FORCE_N / KN / FOOT_M },
  klf: { quantity: 'line-load', toBase: KIP_N / KN / FOOT_M },

  'kN·m': { quantity: 'moment', toBase: 1 },
  'kip·ft': { quantity: 'moment', toBase: (KIP_N / KN) * FOOT_M },
  'lbf·ft': { quantity: 'moment', toBase: (POUND_FORCE_N / KN) * FOOT_M },
  'kip·in': { quantity: 'moment', toBase: (KIP_N / KN) * INCH_M },
};

/** Every unit Panelpoint knows, with its quantity. */
export const UNITS: readonly Unit[] = Object.keys(UNIT_TABLE) as Unit[];

/** True when `name` is a unit this module knows. */
export function unitIsKnown(name: string): name is Unit {
  return Object.prototype.hasOwnProperty.call(UNIT_TABLE, name);
}

function unitDefinition(unit: string): UnitDefinition {
  if (!unitIsKnown(unit)) {
    throw new UnitError(
      'unknown-unit',
      `Unknown unit "${unit}". Use one of: ${UNITS.join(', ')}.`,
    );
  }
  return UNIT_TABLE[unit];
}

/** The quantity a unit measures ('length', 'force', 'pressure', 'line-load', 'moment'). */
export function unitQuantity(unit: Unit): Quantity {
  return unitDefinition(unit).quantity;
}

/**
 * How many base units one `unit` is (base: m, kN, kPa, kN/m, kN·m), e.g. unitFactor('ft') = 0.3048.
 */
export function unitFactor(unit: Unit): number {
  return unitDefinition(unit).toBase;
}

/**
 * Converts `value` from one unit to another of the same quantity.
 * @example unitConvert(20, 'psf', 'kPa') // 0.9576052…
 * @throws UnitError 'incompatible-units' (e.g. kN to m), 'unknown-unit', 'invalid-number' (NaN, ±∞).
 */
export function unitConvert(value: number, from: Unit, to: Unit): number {
  if (!Number.isFinite(value)) {
    throw new UnitError('invalid-number', `Cannot convert ${value} ${from} to ${to}: the value is not a finite number.`);
  }
  const a = unitDefinition(from);
  const b = unitDefinition(to);
  if (a.quantity !== b.quantity) {
    throw new UnitError(
      'incompatible-units',
      `Cannot convert ${from} (${a.quantity}) to ${to} (${b.quantity}): they measure different quantities.`,
    );
  }
  if (from === to) return value;
  return (value * a.toBase) / b.toBase;
}

/** Converts a value in `unit` to the base unit of its quantity (m, kN, kPa, kN/m, kN·m). */
export function unitToBase(value: number, unit: Unit): number {
  return unitConvert(value, unit, baseUnit(unitQuantity(unit)));
}

/** Converts a value in the base unit of `unit`'s quantity to `unit`. */
export function unitFromBase(value: number, unit: Unit): number {
  return unitConvert(value, baseUnit(unitQuantity(unit)), unit);
}

const BASE_UNITS: Record<Quantity, Unit> = {
  length: 'm',
  force: 'kN',
  pressure: 'kPa',
  'line-load': 'kN/m',
  moment: 'kN·m',
};

/** The base (computing) unit of a quantity. */
export function baseUnit(quantity: Quantity): Unit {
  return BASE_UNITS[quantity];
}

/** A unit system of a project: which unit each quantity is shown in. */
export type UnitSystemId = 'si' | 'us';

/**
 * Display units per quantity. SI: m, kN, kPa, kN/m, kN·m. US customary: ft, kip, psf, plf, kip·ft
 * (psf for area loads, the usual way US roof loads are written; stresses use ksi via
 * {@link unitConvert}).
 */
export const UNIT_SYSTEMS: Readonly<Record<UnitSystemId, Readonly<Record<Quantity, Unit>>>> = {
  si: { length: 'm', force: 'kN', pressure: 'kPa', 'line-load': 'kN/m', moment: 'kN·m' },
  us: { length: 'ft', force: 'kip', pressure: 'psf', 'line-load': 'plf', moment: 'kip·ft' },
};

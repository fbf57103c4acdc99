import { INCH_M, unitConvert, type UnitSystemId } from '@shared/units';

/**
 * The units member design is printed in. The checks compute and store in SI (MPa, mm, mm², kN);
 * a US customary project sees them in ksi, in, in², kip — each value converted with the exact
 * factors of shared/units (1 in = 25.4 mm, 1 lbf = 4.4482216152605 N), and each step computed
 * again from the converted values, so its printed numbers multiply out in the units printed.
 */
export interface DesignUnitSet {
  system: UnitSystemId;
  stress: 'MPa' | 'ksi';
  area: 'mm²' | 'in²';
  length: 'mm' | 'in';
  force: 'kN' | 'kip';
  /** Unbraced lengths given by the engineer (the model's own length unit). */
  span: 'm' | 'ft';
}

export const DESIGN_UNITS: Readonly<Record<UnitSystemId, DesignUnitSet>> = {
  si: { system: 'si', stress: 'MPa', area: 'mm²', length: 'mm', force: 'kN', span: 'm' },
  us: { system: 'us', stress: 'ksi', area: 'in²', length: 'in', force: 'kip', span: 'ft' },
};

const MM_PER_IN = INCH_M * 1000; // 25.4 exactly

/** MPa → the set's stress unit. */
export const stressOut = (mpa: number, u: DesignUnitSet): number => (u.system === 'si' ? mpa : unitConvert(mpa, 'MPa', 'ksi'));
/** The set's stress unit → MPa. */
export const stressIn = (v: number, u: DesignUnitSet): number => (u.system === 'si' ? v : unitConvert(v, 'ksi', 'MPa'));
/** mm² → the set's area unit. */
export const areaOut = (mm2: number, u: DesignUnitSet): number => (u.system === 'si' ? mm2 : mm2 / (MM_PER_IN * MM_PER_IN));
export const areaIn = (v: number, u: DesignUnitSet): number => (u.system === 'si' ? v : v * MM_PER_IN * MM_PER_IN);
/** mm → the set's length unit. */
export const lengthOut = (mm: number, u: DesignUnitSet): number => (u.system === 'si' ? mm : mm / MM_PER_IN);
export const lengthIn = (v: number, u: DesignUnitSet): number => (u.system === 'si' ? v : v * MM_PER_IN);
/** kN → the set's force unit. */
export const forceOut = (kN: number, u: DesignUnitSet): number => (u.system === 'si' ? kN : unitConvert(kN, 'kN', 'kip'));
export const forceIn = (v: number, u: DesignUnitSet): number => (u.system === 'si' ? v : unitConvert(v, 'kip', 'kN'));
/** m → the set's span unit (unbraced lengths). */
export const spanOut = (m: number, u: DesignUnitSet): number => (u.system === 'si' ? m : unitConvert(m, 'm', 'ft'));
export const spanIn = (v: number, u: DesignUnitSet): number => (u.system === 'si' ? v : unitConvert(v, 'ft', 'm'));

/**
 * Stress × area in the set's units to its force unit: MPa × mm² = N, so /1000 for kN;
 * ksi × in² = kip.
 */
export const stressAreaToForce = (u: DesignUnitSet): number => (u.system === 'si' ? 1 / 1000 : 1);

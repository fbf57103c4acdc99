import { z } from 'zod';
import { scientificFormat } from '../units/format';

/**
 * Physically sensible bounds for the numbers an engineer or a drawing gives. They are far
 * outside any real truss and exist so that a typing slip or a hostile request (−1e308 kN, a
 * factor of 1e308) is refused with a sentence instead of solving to non-finite forces.
 * Common practice, no source: chosen by us, documented in the README.
 */
export const BOUNDS = {
  /** |x|, |y| of a joint, m (a 100 km drawing is a mistake, not a truss). */
  coordinateM: 100_000,
  /** |fx|, |fy| of one joint load, kN (1 000 MN). */
  jointLoadKn: 1_000_000,
  /** |factor| of a load case in a combination. */
  factor: 10,
  /** E, kN/m²: from 1 kPa to 10 000 GPa. */
  E: { min: 1, max: 1e10 },
  /** A, m²: from 0.01 mm² to 100 m². */
  A: { min: 1e-8, max: 100 },
  /** EA, kN. */
  EA: { min: 1e-6, max: 1e12 },
  /** |area load|, kPa (10 MPa). */
  areaLoadKpa: 10_000,
  /** Truss spacing, m. */
  spacingM: 1_000,
} as const;

const fmt = (v: number) => (Math.abs(v) >= 1e5 || (Math.abs(v) < 1e-3 && v !== 0) ? scientificFormat(v, 1) : v.toLocaleString('en-US'));

/** A finite number within ±`max`, each refusal a sentence naming the value, its unit and the limit. */
export function withinMagnitude(what: string, unit: string, max: number) {
  return z
    .number({ error: `Enter ${what} as a number.` })
    .finite({ error: `${cap(what)} must be a finite number.` })
    .min(-max, { error: `${cap(what)} is below −${fmt(max)}${unit}; check the value and its unit.` })
    .max(max, { error: `${cap(what)} is above ${fmt(max)}${unit}; check the value and its unit.` });
}

/** A finite positive number from `min` to `max`. */
export function withinRange(what: string, unit: string, min: number, max: number) {
  return z
    .number({ error: `Enter ${what} as a number.` })
    .finite({ error: `${cap(what)} must be a finite number.` })
    .positive({ error: `${cap(what)} must be greater than 0.` })
    .min(min, { error: `${cap(what)} is below ${fmt(min)}${unit}; check the value and its unit.` })
    .max(max, { error: `${cap(what)} is above ${fmt(max)}${unit}; check the value and its unit.` });
}

function cap(s: string): string {
  return s.charAt(0).toUpperCase() + s.slice(1);
}

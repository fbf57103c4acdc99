import type { ForceSense } from '@shared/solver';
import { UNIT_DECIMALS, UNIT_SYSTEMS, numberFormat, unitFromBase, type Unit, type UnitSystemId } from '@shared/units';

/** Below this magnitude (kN) a member force is shown as zero: the solver's round-off, not a load. */
export const FORCE_ZERO_KN = 1e-6;

/** The force unit of a project's unit system: kN (SI) or kip (US). */
export function forceUnit(system: UnitSystemId): Unit {
  return UNIT_SYSTEMS[system].force;
}

/** A force given in kN written in the project's unit, fixed decimals, true minus sign, no unit. */
export function forceDigits(kN: number, system: UnitSystemId): string {
  const unit = forceUnit(system);
  return numberFormat(unitFromBase(kN, unit), UNIT_DECIMALS[unit]);
}

/** "−33.54 kN" */
export function forceText(kN: number, system: UnitSystemId): string {
  return `${forceDigits(kN, system)}\u202f${forceUnit(system)}`;
}

/** Tension, compression or zero, with the same round-off limit as the figures. */
export function forceSense(kN: number): ForceSense {
  if (Math.abs(kN) < FORCE_ZERO_KN) return '0';
  return kN > 0 ? 'T' : 'C';
}

/** "(T)", "(C)" or "" for a zero force. */
export function senseMark(sense: ForceSense): string {
  return sense === '0' ? '' : `(${sense})`;
}

/** How a member is drawn in the force diagram. */
export interface ForceStroke {
  sense: ForceSense;
  colour: string;
  /** SVG stroke-dasharray; undefined for a solid line. */
  dash: string | undefined;
  /** px */
  width: number;
}

// Panelpoint's force inks (tailwind `tension`, `compression`, `ink-faint`; docs/visual-language.md).
export const FORCE_COLOURS = { T: '#17706a', C: '#8a4b0f', '0': '#65696c' } as const;

/**
 * Told by line before colour (docs/visual-language.md, "Drawings"): tension a thin continuous
 * line, compression a heavy continuous line, zero force a faint dashed line. The size of a force
 * is written beside its member; `largest` is kept for callers and no longer changes the width.
 */
export function forceStroke(kN: number, _largest: number): ForceStroke {
  const sense = forceSense(kN);
  if (sense === '0') return { sense, colour: FORCE_COLOURS['0'], dash: '6 4', width: 1.25 };
  return { sense, colour: FORCE_COLOURS[sense], dash: undefined, width: sense === 'C' ? 5 : 2 };
}

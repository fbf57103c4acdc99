import type { DxfLengthUnit } from '@shared/dxf-import';
import type { UnitSystem } from '@shared/schemas/project.schema';

/** The units a person may choose for a drawing, with the words shown for them. */
export const DRAWING_UNIT_LABELS: Record<DxfLengthUnit, string> = {
  mm: 'millimetres (mm)',
  cm: 'centimetres (cm)',
  m: 'metres (m)',
  in: 'inches (in)',
  ft: 'feet (ft)',
};

// $INSUNITS codes as listed in the DXF Reference (Autodesk), header variable INSUNITS.
const INSUNITS_NAMES: Record<number, string> = {
  0: 'none (unitless)',
  1: 'inches',
  2: 'feet',
  4: 'millimetres',
  5: 'centimetres',
  6: 'metres',
};

/** What a drawing's $INSUNITS code says, in words: "millimetres", "none (unitless)", "code 14". */
export function insunitsName(code: number): string {
  return INSUNITS_NAMES[code] ?? `code ${code}, not one Panelpoint reads`;
}

/** How tolerances are shown: millimetres for SI projects, inches for US customary ones. */
export interface ToleranceUnit {
  symbol: 'mm' | 'in';
  metresPerUnit: number;
}

/** Exact by definition: 1 mm = 0.001 m; 1 in = 0.0254 m (international inch, 1959). */
export function toleranceUnitFor(system: UnitSystem | undefined): ToleranceUnit {
  return system === 'US' ? { symbol: 'in', metresPerUnit: 0.0254 } : { symbol: 'mm', metresPerUnit: 0.001 };
}

/** A tolerance in metres written in the project's unit with up to 4 significant figures, e.g. "0.5 mm". */
export function formatTolerance(metres: number, unit: ToleranceUnit): string {
  return `${toleranceInUnit(metres, unit)} ${unit.symbol}`;
}

/** A tolerance in metres as a number in the project's unit, rounded to 4 significant figures. */
export function toleranceInUnit(metres: number, unit: ToleranceUnit): number {
  return Number((metres / unit.metresPerUnit).toPrecision(4));
}

/**
 * Reads a tolerance typed in the project's unit and gives metres; undefined for an empty
 * field (the import's default), NaN for anything that is not a number above 0.
 */
export function parseTolerance(text: string, unit: ToleranceUnit): number | undefined {
  const trimmed = text.trim().replace(',', '.');
  if (trimmed === '') return undefined;
  const value = Number(trimmed);
  if (!Number.isFinite(value) || value <= 0) return Number.NaN;
  return value * unit.metresPerUnit;
}

/** A coordinate or length in metres, 3 decimals: "4.500 m". */
export function formatMetres(value: number): string {
  return `${value.toFixed(3)} m`;
}

/** File sizes the way people read them: "18.4 kB". */
export function formatBytes(bytes: number): string {
  if (bytes < 1000) return `${bytes} B`;
  if (bytes < 1_000_000) return `${(bytes / 1000).toFixed(1)} kB`;
  return `${(bytes / 1_000_000).toFixed(1)} MB`;
}

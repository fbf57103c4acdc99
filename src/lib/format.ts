import type { UnitSystem } from '@shared/schemas/project.schema';

const pad = (n: number) => String(n).padStart(2, '0');

/** "2025-03-04 14:05" in the reader's time zone: unambiguous in any firm's locale. */
export function formatDateTime(iso: string): string {
  const date = new Date(iso);
  if (Number.isNaN(date.getTime())) return '—';
  return `${formatDate(iso)} ${pad(date.getHours())}:${pad(date.getMinutes())}`;
}

/** "2025-03-04" in the reader's time zone. */
export function formatDate(iso: string): string {
  const date = new Date(iso);
  if (Number.isNaN(date.getTime())) return '—';
  return `${date.getFullYear()}-${pad(date.getMonth() + 1)}-${pad(date.getDate())}`;
}

export const UNIT_SYSTEM_LABELS: Record<UnitSystem, string> = {
  SI: 'SI (kN, m)',
  US: 'US customary (kip, ft)',
};

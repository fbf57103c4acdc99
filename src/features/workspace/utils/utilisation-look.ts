import { NEAR_FAILING } from '@shared/design/design';

/**
 * Panelpoint's utilisation scale for the design diagram and table: four bands, each darker,
 * wider and more broken than the one before, so the bands stay apart in grey scale and the
 * number is always written beside the member as well.
 *
 *   below 0.5          light slate, thin, solid
 *   0.5 to 0.9         slate blue, medium, solid
 *   0.9 to 1.0 (near)  dark ochre, wide, long dashes
 *   above 1.0 (fails)  near-black red, widest, short dashes
 */
export type UtilisationBand = 'low' | 'mid' | 'near' | 'fails';

export const BAND_LOOK: Record<UtilisationBand, { colour: string; width: number; dash?: string; label: string }> = {
  low: { colour: '#a7b3bf', width: 1.5, label: 'below 0.5' },
  mid: { colour: '#4a6886', width: 2.5, label: '0.5 to 0.9' },
  near: { colour: '#6b4400', width: 4, dash: '10 3', label: `${NEAR_FAILING} to 1.0: near failing` },
  fails: { colour: '#4a0a12', width: 5.5, dash: '4 2', label: 'above 1.0: fails' },
};

export function utilisationBand(u: number, pass = u <= 1): UtilisationBand {
  if (!pass || u > 1) return 'fails';
  if (u >= NEAR_FAILING) return 'near';
  if (u >= 0.5) return 'mid';
  return 'low';
}

/** Relative luminance of a #rrggbb colour (WCAG 2.x definition), for the grey-scale order. */
export function luminance(hex: string): number {
  const c = [1, 3, 5].map((i) => parseInt(hex.slice(i, i + 2), 16) / 255).map((v) => (v <= 0.03928 ? v / 12.92 : ((v + 0.055) / 1.055) ** 2.4));
  return 0.2126 * c[0] + 0.7152 * c[1] + 0.0722 * c[2];
}

/** The utilisation as written on the diagram and in the table: two decimals, a mark when it fails. */
export function utilisationText(u: number, pass: boolean, refused = false): string {
  if (refused) return 'not checked ✗';
  return `${u.toFixed(2)}${pass ? '' : ' ✗'}`;
}

export type DesignFilter = 'all' | 'failing' | 'near' | 'failing-near';

export function designFilterKeep(filter: DesignFilter, u: number, pass: boolean): boolean {
  const band = utilisationBand(u, pass);
  if (filter === 'failing') return band === 'fails';
  if (filter === 'near') return band === 'near';
  if (filter === 'failing-near') return band === 'fails' || band === 'near';
  return true;
}

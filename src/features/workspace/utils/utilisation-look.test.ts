import { describe, expect, it } from 'vitest';
import { BAND_LOOK, designFilterKeep, luminance, utilisationBand, utilisationText } from './utilisation-look';

describe('the utilisation scale', () => {
  it('bands at 0.5, 0.9 (near failing, common practice, no source) and 1.0; a refused or failing member is in the last band', () => {
    expect([0, 0.49, 0.5, 0.89, 0.9, 1, 1.0001].map((u) => utilisationBand(u))).toEqual(['low', 'low', 'mid', 'mid', 'near', 'near', 'fails']);
    expect(utilisationBand(0.3, false)).toBe('fails');
  });

  it('reads in grey scale: each band darker (WCAG 2.x relative luminance) and wider than the one before', () => {
    // The WCAG formula checked on its end points: white 1, black 0 (WCAG 2.1, "relative luminance").
    expect(luminance('#ffffff')).toBeCloseTo(1, 12);
    expect(luminance('#000000')).toBe(0);
    const order = (['low', 'mid', 'near', 'fails'] as const).map((b) => BAND_LOOK[b]);
    for (let i = 1; i < order.length; i++) {
      expect(luminance(order[i].colour)).toBeLessThan(luminance(order[i - 1].colour) * 0.6);
      expect(order[i].width).toBeGreaterThan(order[i - 1].width);
    }
  });

  it('writes the number, and marks failing and refused members', () => {
    expect(utilisationText(0.634, true)).toBe('0.63');
    expect(utilisationText(1.25, false)).toBe('1.25 ✗');
    expect(utilisationText(0.2, false, true)).toBe('not checked ✗');
  });

  it('filters failing and near-failing members', () => {
    const us: [number, boolean][] = [[0.2, true], [0.95, true], [1.2, false], [0.1, false]];
    expect(us.filter(([u, p]) => designFilterKeep('failing', u, p))).toEqual([[1.2, false], [0.1, false]]);
    expect(us.filter(([u, p]) => designFilterKeep('near', u, p))).toEqual([[0.95, true]]);
    expect(us.filter(([u, p]) => designFilterKeep('failing-near', u, p))).toHaveLength(3);
    expect(us.filter(([u, p]) => designFilterKeep('all', u, p))).toHaveLength(4);
  });
});

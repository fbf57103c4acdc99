import { describe, expect, it } from 'vitest';
import config from '../tailwind.config';

// The contrast figures quoted in docs/visual-language.md, recomputed from the tokens themselves.
// Relative luminance and contrast ratio as defined in W3C WCAG 2.1 (definitions of "relative
// luminance" and "contrast ratio"); text needs 4.5:1 (SC 1.4.3, level AA), the edges that
// identify a control 3:1 (SC 1.4.11).

function luminance(hex: string): number {
  const n = Number.parseInt(hex.slice(1), 16);
  const lin = (c: number) => {
    const s = c / 255;
    return s <= 0.04045 ? s / 12.92 : ((s + 0.055) / 1.055) ** 2.4;
  };
  return 0.2126 * lin(n >> 16) + 0.7152 * lin((n >> 8) & 255) + 0.0722 * lin(n & 255);
}

function contrast(a: string, b: string): number {
  const [hi, lo] = [luminance(a), luminance(b)].sort((x, y) => y - x) as [number, number];
  return (hi + 0.05) / (lo + 0.05);
}

const c = config.theme.extend.colors;
const grounds = { table: c.paper.DEFAULT, sheet: c.paper.raised, pad: c.paper.sunk };
const textInks = { ink: c.ink.DEFAULT, 'ink-soft': c.ink.soft, 'ink-faint': c.ink.faint, accent: c.accent.DEFAULT, tension: c.tension, compression: c.compression, danger: c.danger };

describe('contrast of the colour tokens', () => {
  it('computes the published reference pairs (WCAG 2.1: black on white is 21:1; #767676 on white is the commonly quoted 4.54:1)', () => {
    expect(contrast('#000000', '#ffffff')).toBeCloseTo(21, 6);
    expect(contrast('#767676', '#ffffff')).toBeCloseTo(4.54, 2);
  });

  for (const [groundName, ground] of Object.entries(grounds)) {
    for (const [inkName, ink] of Object.entries(textInks)) {
      it(`${inkName} text on the ${groundName} ground reaches 4.5:1 (WCAG 2.1 SC 1.4.3)`, () => {
        expect(contrast(ink, ground)).toBeGreaterThanOrEqual(4.5);
      });
    }
    it(`the control rule on the ${groundName} ground reaches 3:1 (WCAG 2.1 SC 1.4.11)`, () => {
      expect(contrast(c.paper.rule, ground)).toBeGreaterThanOrEqual(3);
    });
  }

  it('the words on a filled accent button reach 4.5:1, at rest and under the pointer', () => {
    expect(contrast(c.paper.raised, c.accent.DEFAULT)).toBeGreaterThanOrEqual(4.5);
    expect(contrast(c.paper.raised, c.accent.hover)).toBeGreaterThanOrEqual(4.5);
  });
});

import { describe, expect, it } from 'vitest';
import { factorFormat, readableFormat, scientificFormat, texScientific } from './format';

// Every expected value below is worked by hand: m × 10ⁿ with 1 ≤ |m| < 10, the mantissa rounded
// half away from zero to the figures asked (the usual scientific notation, from memory).
describe('scientificFormat: m × 10ⁿ with superscript figures', () => {
  it('writes the issue case 2.01e-14 kN as 2.0 × 10⁻¹⁴', () => {
    // 2.01e-14 = 2.01 × 10⁻¹⁴; two figures: 2.0.
    expect(scientificFormat(2.01e-14, 2)).toBe('2.0 × 10⁻¹⁴');
  });
  it('keeps three figures with their trailing zero', () => {
    // 3.6e-15 = 3.60 × 10⁻¹⁵ to three figures.
    expect(scientificFormat(3.6e-15, 3)).toBe('3.60 × 10⁻¹⁵');
  });
  it('carries a rounded mantissa into the exponent', () => {
    // 9.96 × 10⁻⁵ to two figures: 10 × 10⁻⁵ = 1.0 × 10⁻⁴.
    expect(scientificFormat(9.96e-5, 2)).toBe('1.0 × 10⁻⁴');
  });
  it('writes negative numbers with the typographic minus, or a hyphen for plain text', () => {
    // −0.000 123 4 = −1.234 × 10⁻⁴ → −1.2 × 10⁻⁴.
    expect(scientificFormat(-0.0001234, 2)).toBe('\u22121.2 × 10⁻⁴');
    expect(scientificFormat(-0.0001234, 2, { asciiMinus: true })).toBe('-1.2 × 10⁻⁴');
  });
  it('writes positive exponents and leaves out × 10⁰', () => {
    // 1 234 567 = 1.234 567 × 10⁶ → 1.23 × 10⁶; 5 = 5.0 × 10⁰ → 5.0.
    expect(scientificFormat(1234567, 3)).toBe('1.23 × 10⁶');
    expect(scientificFormat(5, 2)).toBe('5.0');
    expect(scientificFormat(0, 2)).toBe('0');
  });
  it('refuses what is not a number', () => {
    expect(() => scientificFormat(Number.NaN)).toThrow(/not a finite number/);
    expect(() => scientificFormat(1, 0)).toThrow(/Significant figures/);
  });
});

describe('texScientific: the same for KaTeX', () => {
  it('writes \\times 10^{n}', () => {
    expect(texScientific(2.01e-14, 3)).toBe('2.01 \\times 10^{-14}');
    expect(texScientific(-4.5e-3, 2)).toBe('-4.5 \\times 10^{-3}');
    expect(texScientific(0)).toBe('0');
  });
});

describe('readableFormat: fixed decimals while they show the number', () => {
  it('keeps fixed decimals for ordinary values', () => {
    expect(readableFormat(0.5, 3)).toBe('0.500');
    expect(readableFormat(-12.3456, 2)).toBe('\u221212.35');
    expect(readableFormat(0, 3)).toBe('0.000');
  });
  it('switches to m × 10ⁿ where fixed decimals would print 0.000', () => {
    // 3.6e-15 with 3 decimals would read 0.000; two figures: 3.6 × 10⁻¹⁵.
    expect(readableFormat(3.6e-15, 3)).toBe('3.6 × 10⁻¹⁵');
    // 0.001 is exactly 10⁻³: still shown as 0.001.
    expect(readableFormat(0.001, 3)).toBe('0.001');
    expect(readableFormat(2.5e7, 2)).toBe('2.5 × 10⁷');
  });
});

describe('factorFormat: a load factor with all its digits', () => {
  it('never cuts a factor short', () => {
    // 0.85 × 1.35 = 1.1475 (EN 1990 6.10b with ξ = 0.85, γ_G = 1.35; the product worked by hand).
    expect(factorFormat(0.85 * 1.35)).toBe('1.1475');
    expect(factorFormat(1.5)).toBe('1.5');
    expect(factorFormat(1)).toBe('1');
    expect(factorFormat(0.45)).toBe('0.45');
    expect(factorFormat(-0.9)).toBe('\u22120.9');
    expect(factorFormat(-0.9, { asciiMinus: true })).toBe('-0.9');
  });
});

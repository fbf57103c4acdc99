import { describe, expect, it } from 'vitest';
import {
  FOOT_M,
  INCH_M,
  KIP_N,
  MINUS_SIGN,
  POUND_FORCE_N,
  UNITS,
  UNIT_SPACE,
  UnitError,
  numberFormat,
  quantityFormat,
  unitConvert,
  unitFormat,
  unitQuantity,
} from './index';

/** Relative closeness, for factors quoted to 7 significant figures. */
function expectRelative(actual: number, expected: number, rel: number) {
  expect(Math.abs(actual - expected) / Math.abs(expected)).toBeLessThan(rel);
}

describe('exact definitions', () => {
  // 1959 international yard and pound agreement; NIST SP 811 (2008) §B.8: 1 ft = 0.3048 m exactly,
  // 1 in = 0.0254 m exactly, 1 lb = 0.45359237 kg exactly; standard gravity 9.80665 m/s² (3rd CGPM, 1901).
  it('when the foot and inch are converted, then they are exactly 0.3048 m and 0.0254 m', () => {
    expect(FOOT_M).toBe(0.3048);
    expect(INCH_M).toBeCloseTo(0.0254, 15);
    expect(unitConvert(1, 'ft', 'm')).toBe(0.3048);
    expect(unitConvert(12, 'in', 'ft')).toBeCloseTo(1, 14);
    expect(unitConvert(1, 'in', 'mm')).toBeCloseTo(25.4, 12);
  });

  it('when the pound-force is built from mass and standard gravity, then it equals 4.4482216152605 N', () => {
    // 0.45359237 kg × 9.80665 m/s² (both exact by definition).
    expect(POUND_FORCE_N).toBeCloseTo(0.45359237 * 9.80665, 13);
    expect(unitConvert(1, 'lbf', 'N')).toBeCloseTo(4.4482216152605, 12);
    expect(KIP_N).toBeCloseTo(4448.2216152605, 9);
    expect(unitConvert(1, 'kip', 'kN')).toBeCloseTo(4.4482216152605, 12);
  });
});

describe('NIST SP 811 Appendix B.8 factors (7 significant figures, quoted from memory)', () => {
  const cases: Array<[string, number, Parameters<typeof unitConvert>[1], Parameters<typeof unitConvert>[2]]> = [
    // pound-force per square foot = 4.788 026 E+01 Pa
    ['psf → Pa', 47.88026, 'psf', 'Pa'],
    // pound-force per square inch = 6.894 757 E+03 Pa
    ['psi → Pa', 6894.757, 'psi', 'Pa'],
    // kip per square inch = 6.894 757 E+06 Pa
    ['ksi → MPa', 6.894757, 'ksi', 'MPa'],
    // pound-force per foot = 1.459 390 E+01 N/m
    ['plf → N/m', 14.5939, 'plf', 'N/m'],
    // pound-force foot = 1.355 818 E+00 N·m
    ['lbf·ft → kN·m', 1.355818e-3, 'lbf·ft', 'kN·m'],
    // kip = 4.448 222 E+03 N
    ['kip → N', 4448.222, 'kip', 'N'],
  ];
  for (const [label, expected, from, to] of cases) {
    it(`when 1 ${label.split(' ')[0]} is converted, then it matches ${expected}`, () => {
      expectRelative(unitConvert(1, from, to), expected, 1e-6);
    });
  }
});

describe('published conversions', () => {
  it('when the ASCE 7 roof live load of 20 psf is converted, then it is the 0.96 kN/m² printed beside it', () => {
    // ASCE/SEI 7-16 Table 4.3-1 gives 20 psf (0.96 kN/m²) for ordinary roofs (from memory).
    expect(unitConvert(20, 'psf', 'kN/m²')).toBeCloseTo(0.96, 2);
  });

  it('when 1 kPa is converted to psf, then it is 20.885 psf (inverse of 47.880 26 Pa)', () => {
    expectRelative(unitConvert(1, 'kPa', 'psf'), 1000 / 47.88026, 1e-6);
  });

  it('when 50 ksi steel is converted, then it is 344.7 MPa', () => {
    // 50 × 6.894 757 = 344.738 MPa (NIST SP 811 factor, from memory).
    expect(unitConvert(50, 'ksi', 'MPa')).toBeCloseTo(344.738, 3);
    expect(unitConvert(50, 'ksi', 'kN/m²')).toBeCloseTo(344738, 0);
  });

  it('when 40 plf is converted, then it is 0.5838 kN/m (20 psf on 2 ft centres)', () => {
    expect(unitConvert(40, 'plf', 'kN/m')).toBeCloseTo(0.58376, 5);
    expect(unitConvert(1, 'klf', 'plf')).toBeCloseTo(1000, 9);
  });

  it('when a kip·ft is converted, then it is 1.355 818 kN·m and 12 kip·in', () => {
    expectRelative(unitConvert(1, 'kip·ft', 'kN·m'), 1.355818, 1e-6);
    expect(unitConvert(1, 'kip·ft', 'kip·in')).toBeCloseTo(12, 12);
  });
});

describe('round trips and errors', () => {
  it('when any unit is converted to its base unit and back, then the value returns unchanged', () => {
    for (const unit of UNITS) {
      const base = { length: 'm', force: 'kN', pressure: 'kPa', 'line-load': 'kN/m', moment: 'kN·m' }[
        unitQuantity(unit)
      ] as typeof unit;
      const there = unitConvert(123.456, unit, base);
      expect(unitConvert(there, base, unit)).toBeCloseTo(123.456, 9);
    }
  });

  it('when a force is converted to a length, then an incompatible-units error names both units', () => {
    expect(() => unitConvert(1, 'kN', 'm')).toThrowError(UnitError);
    try {
      unitConvert(1, 'kN', 'm');
    } catch (error) {
      expect((error as UnitError).code).toBe('incompatible-units');
      expect((error as UnitError).message).toContain('kN');
      expect((error as UnitError).message).toContain('m (length)');
    }
  });

  it('when an unknown unit or NaN is given, then a typed error is thrown', () => {
    expect(() => unitConvert(1, 'furlong' as never, 'm')).toThrowError(/Unknown unit "furlong"/);
    expect(() => unitConvert(Number.NaN, 'm', 'ft')).toThrowError(/not a finite number/);
  });
});

describe('formatting', () => {
  it('when a value is formatted, then it has the fixed decimals of its unit and the unit after a narrow space', () => {
    expect(unitFormat(4.5, 'kN/m')).toBe(`4.50${UNIT_SPACE}kN/m`);
    expect(unitFormat(2.23607, 'm')).toBe(`2.236${UNIT_SPACE}m`);
    expect(unitFormat(20, 'psf')).toBe(`20.0${UNIT_SPACE}psf`);
    expect(unitFormat(-55.9017, 'kN')).toBe(`${MINUS_SIGN}55.90${UNIT_SPACE}kN`);
  });

  it('when a negative value rounds to zero, then no minus sign is written', () => {
    expect(numberFormat(-0.0004, 3)).toBe('0.000');
    expect(numberFormat(-0, 2)).toBe('0.00');
  });

  it('when a value sits on a half, then it rounds away from zero', () => {
    expect(numberFormat(1.005, 2)).toBe('1.01');
    expect(numberFormat(-2.5, 0)).toBe(`${MINUS_SIGN}3`);
  });

  it('when grouping and signs are asked for, then thousands get a thin space and positives a plus', () => {
    expect(numberFormat(1234567.891, 2, { group: true, signed: true })).toBe('+1\u2009234\u2009567.89');
    expect(numberFormat(-12.5, 1, { asciiMinus: true })).toBe('-12.5');
  });

  it('when a base value is shown in US units, then it is converted and labelled', () => {
    // 0.957 605 kPa is 20 psf (NIST factor 47.880 26 Pa/psf).
    expect(quantityFormat(unitConvert(20, 'psf', 'kPa'), 'pressure', 'us')).toBe(`20.0${UNIT_SPACE}psf`);
    expect(quantityFormat(4.4482216152605, 'force', 'us')).toBe(`1.00${UNIT_SPACE}kip`);
    expect(quantityFormat(3.048, 'length', 'us')).toBe(`10.00${UNIT_SPACE}ft`);
  });

  it('when NaN is formatted, then an error is thrown rather than "NaN" printed', () => {
    expect(() => unitFormat(Number.NaN, 'kN')).toThrowError(UnitError);
  });
});

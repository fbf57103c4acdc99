import { describe, expect, it } from 'vitest';
import { DesignError } from './errors';
import { sectionProperties } from './sections';

/** Area and second moments of a simple polygon by Green's theorem (shoelace sums), an independent route. */
function polygon(pts: [number, number][]) {
  let A = 0;
  let Sx = 0;
  let Sy = 0;
  let Ixx = 0;
  let Iyy = 0;
  let Ixy = 0;
  for (let i = 0; i < pts.length; i++) {
    const [x0, y0] = pts[i];
    const [x1, y1] = pts[(i + 1) % pts.length];
    const c = x0 * y1 - x1 * y0;
    A += c / 2;
    Sx += ((x0 + x1) * c) / 6;
    Sy += ((y0 + y1) * c) / 6;
    Ixx += ((y0 * y0 + y0 * y1 + y1 * y1) * c) / 12;
    Iyy += ((x0 * x0 + x0 * x1 + x1 * x1) * c) / 12;
    Ixy += ((x0 * y1 + 2 * x0 * y0 + 2 * x1 * y1 + x1 * y0) * c) / 24;
  }
  const xc = Sx / A;
  const yc = Sy / A;
  return { A, xc, yc, Ixx: Ixx - A * yc * yc, Iyy: Iyy - A * xc * xc, Ixy: Ixy - A * xc * yc };
}

describe('sections by dimensions', () => {
  it('solid rectangle: r = d/√12 (closed form)', () => {
    const s = sectionProperties({ shape: 'rectangle', b: 45, d: 140 }, 'W1');
    expect(s.A).toBe(6300);
    expect(s.rx).toBeCloseTo(140 / Math.sqrt(12), 12);
    expect(s.ry).toBeCloseTo(45 / Math.sqrt(12), 12);
    expect(s.dx).toBe(140);
  });
  it('round hollow: A = π(D² − d²)/4, I = π(D⁴ − d⁴)/64 (closed form)', () => {
    const s = sectionProperties({ shape: 'round-hollow', D: 114.3, t: 5 }, 'C1');
    const di = 104.3;
    const A = (Math.PI * (114.3 ** 2 - di ** 2)) / 4;
    expect(s.A).toBeCloseTo(A, 9);
    expect(s.rx).toBeCloseTo(Math.sqrt((Math.PI * (114.3 ** 4 - di ** 4)) / 64 / A), 9);
  });
  it('rectangular hollow matches the polygon integration of outer minus inner rectangle', () => {
    const s = sectionProperties({ shape: 'rect-hollow', B: 100, H: 150, t: 6 }, 'R1');
    const out = polygon([[0, 0], [100, 0], [100, 150], [0, 150]]);
    const inn = polygon([[6, 6], [94, 6], [94, 144], [6, 144]]);
    const A = out.A - inn.A;
    expect(s.A).toBeCloseTo(A, 9);
    expect(s.rx).toBeCloseTo(Math.sqrt((out.Ixx - inn.Ixx) / A), 9);
    expect(s.ry).toBeCloseTo(Math.sqrt((out.Iyy - inn.Iyy) / A), 9);
  });
  it('unequal angle: least principal radius from the polygon integration (Mohr circle of Ixx, Iyy, Ixy)', () => {
    const s = sectionProperties({ shape: 'angle', b: 100, d: 150, t: 10 }, 'A1');
    const p = polygon([[0, 0], [100, 0], [100, 10], [10, 10], [10, 150], [0, 150]]);
    const Imin = (p.Ixx + p.Iyy) / 2 - Math.hypot((p.Ixx - p.Iyy) / 2, p.Ixy);
    expect(s.A).toBeCloseTo(p.A, 9);
    expect(s.rx).toBeCloseTo(Math.sqrt(Imin / p.A), 9);
    expect(s.ry).toBe(s.rx);
  });
  it('equal angle 100 × 100 × 10 is near the handbook values A ≈ 19.2 cm², i_v ≈ 1.95 cm (EN 10056-1 tables with root radius, from memory)', () => {
    const s = sectionProperties({ shape: 'angle', b: 100, d: 100, t: 10 }, 'A2');
    expect(s.A).toBe(1900);
    expect(Math.abs(s.rx - 19.5) / 19.5).toBeLessThan(0.03);
  });
  it('two angles back to back: out-of-plane I by the parallel-axis theorem, from the polygons of both angles', () => {
    const s = sectionProperties({ shape: 'double-angle', b: 80, d: 80, t: 8, s: 10 }, 'D1');
    // Right angle: vertical leg back at x = 5, horizontal leg out to x = 85; left one mirrored.
    const right = polygon([[5, 0], [85, 0], [85, 8], [13, 8], [13, 80], [5, 80]]);
    const left = polygon([[-5, 0], [-5, 80], [-13, 80], [-13, 8], [-85, 8], [-85, 0]]);
    const A = right.A + left.A;
    const Iy = right.Iyy + right.A * right.xc ** 2 + left.Iyy + left.A * left.xc ** 2;
    expect(s.A).toBeCloseTo(A, 9);
    expect(s.ry).toBeCloseTo(Math.sqrt(Iy / A), 9);
    expect(s.rx).toBeCloseTo(Math.sqrt(right.Ixx / right.A), 9);
  });
});

describe('bad sections: one sentence, typed error', () => {
  it.each([
    [{ shape: 'properties', A: 0, rx: 10, ry: 10 }, /A of the section of M1 must be a positive number/],
    [{ shape: 'properties', A: 100, rx: -1, ry: 10 }, /rx of the section of M1/],
    [{ shape: 'rectangle', b: 45, d: 0 }, /d of the section of M1/],
    [{ shape: 'round-hollow', D: 50, t: 30 }, /more than half its diameter/],
    [{ shape: 'angle', b: 50, d: 50, t: 50 }, /not less than its legs/],
    [{ shape: 'properties', A: 100, rx: 10, ry: 10, An: 120 }, /net area An = 120/],
  ] as const)('%o', (input, message) => {
    expect(() => sectionProperties(input as never, 'M1')).toThrow(DesignError);
    expect(() => sectionProperties(input as never, 'M1')).toThrow(message);
  });
});

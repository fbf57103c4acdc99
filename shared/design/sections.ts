import { DesignError } from './errors';

/**
 * Cross-sections for axial checks. Units: mm, mm².
 *
 * "In plane" is buckling in the plane of the truss (radius rx), "out of plane" across it (ry).
 * Shapes are computed with sharp corners (root and corner radii neglected, which slightly
 * under-estimates A and r, the conservative side).
 */
export type SectionInput =
  | { shape: 'properties'; A: number; rx: number; ry: number; An?: number; U?: number }
  /** b across the truss plane, d in the plane. */
  | { shape: 'rectangle'; b: number; d: number; An?: number; U?: number }
  | { shape: 'round-hollow'; D: number; t: number; An?: number; U?: number }
  /** B across the truss plane, H in the plane. */
  | { shape: 'rect-hollow'; B: number; H: number; t: number; An?: number; U?: number }
  /** Single angle: leg b, leg d, thickness t (b = d for an equal angle). */
  | { shape: 'angle'; b: number; d: number; t: number; An?: number; U?: number }
  /** Two angles back to back, legs d vertical back to back, gap s between them (gusset). */
  | { shape: 'double-angle'; b: number; d: number; t: number; s: number; An?: number; U?: number };

export interface Section {
  shape: SectionInput['shape'];
  /** Gross area, mm². */
  A: number;
  /** Radius of gyration for in-plane buckling, mm. */
  rx: number;
  /** Radius of gyration for out-of-plane buckling, mm. */
  ry: number;
  /** Net area, mm² (defaults to A: no holes). */
  An: number;
  /** Shear-lag factor (AISC 360-16 D3; defaults to 1.0). */
  U: number;
  /** Least dimension across each axis for timber ℓe/d, mm (r·√12 for a solid rectangle). */
  dx: number;
  dy: number;
  /** Notes on how the properties were taken. */
  notes: string[];
}

function pos(v: unknown, name: string, where: string): number {
  if (typeof v !== 'number' || !Number.isFinite(v) || v <= 0) throw new DesignError('bad-section', `${name} of the section of ${where} must be a positive number (it is ${String(v)}).`);
  return v;
}

/** Angle with the d leg vertical at x ∈ [0, t] and the b leg along y ∈ [0, t]: area, centroid, I about centroid. */
function angleParts(b: number, d: number, t: number) {
  const r = [
    { w: t, h: d, cx: t / 2, cy: d / 2 },
    { w: b - t, h: t, cx: t + (b - t) / 2, cy: t / 2 },
  ];
  const A = r.reduce((s, p) => s + p.w * p.h, 0);
  const xc = r.reduce((s, p) => s + p.w * p.h * p.cx, 0) / A;
  const yc = r.reduce((s, p) => s + p.w * p.h * p.cy, 0) / A;
  let Ixx = 0; // about horizontal centroidal axis
  let Iyy = 0; // about vertical centroidal axis
  let Ixy = 0;
  for (const p of r) {
    const a = p.w * p.h;
    Ixx += (p.w * p.h ** 3) / 12 + a * (p.cy - yc) ** 2;
    Iyy += (p.h * p.w ** 3) / 12 + a * (p.cx - xc) ** 2;
    Ixy += a * (p.cx - xc) * (p.cy - yc);
  }
  const mid = (Ixx + Iyy) / 2;
  const rad = Math.hypot((Ixx - Iyy) / 2, Ixy);
  return { A, xc, yc, Ixx, Iyy, Imin: mid - rad };
}

/** Properties of a section; throws `bad-section` (one sentence) for zero, negative or impossible values. */
export function sectionProperties(s: SectionInput, where: string): Section {
  const notes: string[] = [];
  let A: number;
  let rx: number;
  let ry: number;
  let dx: number;
  let dy: number;
  switch (s.shape) {
    case 'properties': {
      A = pos(s.A, 'A', where);
      rx = pos(s.rx, 'rx', where);
      ry = pos(s.ry, 'ry', where);
      dx = rx * Math.sqrt(12);
      dy = ry * Math.sqrt(12);
      break;
    }
    case 'rectangle': {
      const b = pos(s.b, 'b', where);
      const d = pos(s.d, 'd', where);
      A = b * d;
      rx = d / Math.sqrt(12);
      ry = b / Math.sqrt(12);
      dx = d;
      dy = b;
      break;
    }
    case 'round-hollow': {
      const D = pos(s.D, 'D', where);
      const t = pos(s.t, 't', where);
      if (2 * t > D) throw new DesignError('bad-section', `The wall t = ${t} mm of the section of ${where} is more than half its diameter D = ${D} mm.`);
      const di = D - 2 * t;
      A = (Math.PI / 4) * (D * D - di * di);
      rx = ry = Math.sqrt((D * D + di * di) / 16);
      dx = dy = rx * Math.sqrt(12);
      break;
    }
    case 'rect-hollow': {
      const B = pos(s.B, 'B', where);
      const H = pos(s.H, 'H', where);
      const t = pos(s.t, 't', where);
      if (2 * t >= Math.min(B, H)) throw new DesignError('bad-section', `The wall t = ${t} mm of the section of ${where} leaves no hollow in ${B} × ${H} mm; use a solid rectangle.`);
      const bi = B - 2 * t;
      const hi = H - 2 * t;
      A = B * H - bi * hi;
      rx = Math.sqrt((B * H ** 3 - bi * hi ** 3) / 12 / A);
      ry = Math.sqrt((H * B ** 3 - hi * bi ** 3) / 12 / A);
      dx = rx * Math.sqrt(12);
      dy = ry * Math.sqrt(12);
      notes.push('Corners taken square (corner radii neglected).');
      break;
    }
    case 'angle':
    case 'double-angle': {
      const b = pos(s.b, 'b', where);
      const d = pos(s.d, 'd', where);
      const t = pos(s.t, 't', where);
      if (t >= Math.min(b, d)) throw new DesignError('bad-section', `The thickness t = ${t} mm of the angle of ${where} is not less than its legs ${b} × ${d} mm.`);
      const p = angleParts(b, d, t);
      if (s.shape === 'angle') {
        A = p.A;
        rx = ry = Math.sqrt(p.Imin / p.A);
        notes.push('Single angle: the least radius of gyration (principal axis) is used in and out of plane (conservative).');
      } else {
        const gap = typeof s.s === 'number' && Number.isFinite(s.s) && s.s >= 0 ? s.s : (() => {
          throw new DesignError('bad-section', `The gap s between the angles of ${where} must be zero or a positive number of mm.`);
        })();
        A = 2 * p.A;
        rx = Math.sqrt(p.Ixx / p.A);
        ry = Math.sqrt((2 * (p.Iyy + p.A * (p.xc + gap / 2) ** 2)) / A);
        notes.push('Two angles acting together: interconnectors must satisfy AISC 360-16 §E6 / EN 1993-1-1 §6.4; the modified slenderness for the connector spacing is not applied here.');
      }
      dx = rx * Math.sqrt(12);
      dy = ry * Math.sqrt(12);
      notes.push('Fillet and toe radii neglected.');
      break;
    }
    default:
      throw new DesignError('bad-section', `The section of ${where} has an unknown shape.`);
  }
  const An = s.An === undefined ? A : pos(s.An, 'An', where);
  const U = s.U === undefined ? 1 : pos(s.U, 'U', where);
  if (An > A * (1 + 1e-9)) throw new DesignError('bad-section', `The net area An = ${An} mm² of ${where} is larger than its gross area A = ${A.toFixed(1)} mm².`);
  if (U > 1) throw new DesignError('bad-section', `The shear-lag factor U = ${U} of ${where} is above 1.0 (AISC 360-16 Table D3.1).`);
  if (s.An === undefined) notes.push('Net area taken equal to the gross area (no holes); give An for bolted ends.');
  if (s.U === undefined) notes.push('Shear-lag factor U = 1.0 taken (all elements connected); give U from AISC 360-16 Table D3.1 otherwise.');
  return { shape: s.shape, A, rx, ry, An, U, dx, dy, notes };
}

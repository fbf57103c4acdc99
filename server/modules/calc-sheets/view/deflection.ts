import { num, operandSig } from '@shared/design/steps';
import { areaOut, DESIGN_UNITS, forceOut, lengthOut, stressOut, stressAreaToForce } from '@shared/design/units';
import { SHAPE_JOINT_LIMIT } from '@shared/design/deflected-shape';
import { deflectedShapeSvg } from '@shared/drawing/truss-svg';
import type { SheetSection } from './context';
import type { TableRow } from './types';

/** A deflection or length in the sheet's unit: mm to 2 decimals, in to 3 (0.001 in ≈ 0.03 mm). */
const fixed = (v: number | null, decimals: number) =>
  v === null || !Number.isFinite(v) ? '—' : `${v < 0 && Math.abs(v) >= 0.5 * 10 ** -decimals ? '\u2212' : ''}${Math.abs(v).toFixed(decimals)}`;

/**
 * Joint deflections by the unit-load (virtual work) method, δ = Σ n·N·L/(A·E): the summary
 * against the engineer's span/deflection limit, then for each joint and service combination
 * the table of n, N, L, A, E and n·N·L/(A·E) with its sum.
 */
export const deflectionSection: SheetSection<'deflection'> = {
  build({ input, unstable, model, system }) {
    const list = input.design && !input.design.error && !unstable ? input.design.deflection : [];
    const u = DESIGN_UNITS[system];
    const us = u.system === 'us';
    const dec = us ? 3 : 2;
    const mm = (v: number | null) => fixed(v === null ? null : lengthOut(v, u), dec);
    const note = us
      ? 'δ = Σ n·N·L/(A·E) (unit-load method): N the member force of the service combination, n that of a unit load at the joint in the direction of δ; N in kip, L in in, A in in², E in ksi, so each term is in inches. Positive δy is up. The span is between the outermost supports; the span/deflection limit is the engineer’s (180, 240 and 360 are common practice, no source).'
      : 'δ = Σ n·N·L/(A·E) (unit-load method): N the member force of the service combination, n that of a unit load at the joint in the direction of δ; L in mm, A in mm², E in MPa, N in kN (×1000 to N). Positive δy is up. The span is between the outermost supports; the span/deflection limit is the engineer’s (180, 240 and 360 are common practice, no source).';
    const rows: TableRow[] = list.map((r) => {
      const allowed = mm(r.allowed);
      const span = lengthOut(r.span, u);
      const sig = Number.isFinite(r.allowed) ? operandSig([span], ([s]) => s / r.limit, allowed) : 5;
      return {
        cells: [r.tag, r.combination, mm(r.dx), mm(r.dy), `${num(span, sig)}/${num(r.limit)} = ${allowed}`, r.ratio === null || !Number.isFinite(r.ratio) ? '—' : num(r.ratio, 3), r.pass ? 'OK' : 'FAILS'],
        cls: r.pass ? undefined : 'is-bad',
      };
    });
    // n·N·L/(A·E): SI N kN → N (×1000) over MPa·mm² gives mm; US kip·in over ksi·in² gives in.
    const k = 1 / stressAreaToForce(u);
    const tables = list.map((r) => ({
      title: `Vertical deflection at ${r.tag} under ${r.combination}`,
      rows: r.tableY.map((t) => {
        const ops = [t.n, forceOut(t.N, u), lengthOut(t.L, u), areaOut(t.A, u), stressOut(t.E, u)];
        const term = num(lengthOut(t.term, u), 5);
        const sig = operandSig(ops, ([n, N, L, A, E]) => (n * N * k * L) / (A * E), term);
        return { cells: [t.tag, ...ops.map((o) => num(o, sig)), term] };
      }),
      sum: `Σ = δy = ${mm(r.dy)} ${u.length}`,
    }));
    const shapeList = list.length ? input.design?.shapes : [];
    const shapes = (shapeList ?? []).map((s) => ({
      title: `Deflected shape under ${s.combination}`,
      svg: deflectedShapeSvg(model, s, { label: `Deflected shape under ${s.combination}`, maxText: `${mm(s.maxMm)} ${u.length}` }),
    }));
    const shapesNote =
      list.length === 0
        ? null
        : shapeList === null
          ? `The deflected shape is not drawn for a truss of more than ${SHAPE_JOINT_LIMIT} joints; the deflections above are complete.`
          : shapeList === undefined
            ? 'This run was made before deflected shapes were drawn; run the truss again to draw it.'
            : 'The shape: every joint’s movement by the direct stiffness method with the same A and E, which gives the deflections of the table at the joints checked.';
    return {
      view: { deflection: { present: list.length > 0, rows, tables, note, shapes, shapesNote, units: { length: u.length, force: u.force, area: u.area, stress: u.stress } } },
      contents: list.length ? [{ anchor: 'deflection', title: 'Deflection (unit-load method)' }] : [],
      summary: list.length
        ? [{ label: 'Deflection', value: list.every((r) => r.pass) ? `within the limits at ${list.length} check${list.length === 1 ? '' : 's'}` : `${list.filter((r) => !r.pass).length} check(s) beyond the limit` }]
        : [],
    };
  },
};

import { num } from '@shared/design/steps';
import { SHAPE_JOINT_LIMIT } from '@shared/design/deflected-shape';
import { deflectedShapeSvg } from '@shared/drawing/truss-svg';
import type { SheetSection } from './context';
import type { TableRow } from './types';

const mm = (v: number | null) => (v === null || !Number.isFinite(v) ? '—' : `${v < 0 ? '\u2212' : ''}${Math.abs(v).toFixed(2)}`);

/**
 * Joint deflections by the unit-load (virtual work) method, δ = Σ n·N·L/(A·E): the summary
 * against the engineer's span/deflection limit, then for each joint and service combination
 * the table of n, N, L, A, E and n·N·L/(A·E) with its sum.
 */
export const deflectionSection: SheetSection<'deflection'> = {
  build({ input, unstable, model }) {
    const list = input.design && !input.design.error && !unstable ? input.design.deflection : [];
    const note =
      'δ = Σ n·N·L/(A·E) (unit-load method): N the member force of the service combination, n that of a unit load at the joint in the direction of δ; L in mm, A in mm², E in MPa, N in kN (×1000 to N). Positive δy is up. The span is between the outermost supports; the span/deflection limit is the engineer’s (180, 240 and 360 are common practice, no source).';
    const rows: TableRow[] = list.map((r) => ({
      cells: [r.tag, r.combination, mm(r.dx), mm(r.dy), `${num(r.span)}/${num(r.limit)} = ${mm(r.allowed)}`, r.ratio === null || !Number.isFinite(r.ratio) ? '—' : num(r.ratio, 3), r.pass ? 'OK' : 'FAILS'],
      cls: r.pass ? undefined : 'is-bad',
    }));
    const tables = list.map((r) => ({
      title: `Vertical deflection at ${r.tag} under ${r.combination}`,
      rows: r.tableY.map((t) => ({ cells: [t.tag, num(t.n, 5), num(t.N, 5), num(t.L, 5), num(t.A, 5), num(t.E, 5), num(t.term, 5)] })),
      sum: `Σ = δy = ${mm(r.dy)} mm`,
    }));
    const shapeList = list.length ? input.design?.shapes : [];
    const shapes = (shapeList ?? []).map((s) => ({
      title: `Deflected shape under ${s.combination}`,
      svg: deflectedShapeSvg(model, s, { label: `Deflected shape under ${s.combination}`, maxText: `${mm(s.maxMm)} mm` }),
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
      view: { deflection: { present: list.length > 0, rows, tables, note, shapes, shapesNote } },
      contents: list.length ? [{ anchor: 'deflection', title: 'Deflection (unit-load method)' }] : [],
      summary: list.length
        ? [{ label: 'Deflection', value: list.every((r) => r.pass) ? `within the limits at ${list.length} check${list.length === 1 ? '' : 's'}` : `${list.filter((r) => !r.pass).length} check(s) beyond the limit` }]
        : [],
    };
  },
};

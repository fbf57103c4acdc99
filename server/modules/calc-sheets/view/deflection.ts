import { num } from '@shared/design/steps';
import type { SheetSection } from './context';
import type { TableRow } from './types';

const mm = (v: number | null) => (v === null || !Number.isFinite(v) ? '—' : `${v < 0 ? '\u2212' : ''}${Math.abs(v).toFixed(2)}`);

/**
 * Joint deflections by the unit-load (virtual work) method, δ = Σ n·N·L/(A·E): the summary
 * against the engineer's span/deflection limit, then for each joint and service combination
 * the table of n, N, L, A, E and n·N·L/(A·E) with its sum.
 */
export const deflectionSection: SheetSection<'deflection'> = {
  build({ input, unstable }) {
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
    return {
      view: { deflection: { present: list.length > 0, rows, tables, note } },
      contents: list.length ? [{ anchor: 'deflection', title: 'Deflection (unit-load method)' }] : [],
      summary: list.length
        ? [{ label: 'Deflection', value: list.every((r) => r.pass) ? `within the limits at ${list.length} check${list.length === 1 ? '' : 's'}` : `${list.filter((r) => !r.pass).length} check(s) beyond the limit` }]
        : [],
    };
  },
};

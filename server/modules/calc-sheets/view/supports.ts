import { numberFormat } from '@shared/units';
import type { SheetSection } from './context';

/** Supports with what they restrain, and the members' materials and stiffness. */
export const supportsSection: SheetSection<'supports'> = {
  build({ model, analysis, tags }) {
    return {
      view: {
        supports: {
          rows: model.supports.map((s) => ({
            cells: [
              tags.joint(s.joint),
              s.kind === 'pin' ? 'Pin' : 'Roller',
              s.kind === 'pin' ? 'x and y' : `at ${numberFormat(s.angleDeg, 1)}° from horizontal`,
              s.kind === 'pin' ? '2' : '1',
            ],
          })),
          materialRows: model.members
            .filter((m) => m.material || m.section || m.E || m.A || m.EA)
            .map((m) => ({
              cells: [
                m.tag,
                m.material ?? '—',
                m.section ?? '—',
                m.E ? numberFormat(m.E / 1e6, 1) : '—',
                m.A ? numberFormat(m.A * 1e6, 0) : '—',
                m.EA ? numberFormat(m.EA, 0) : m.E && m.A ? numberFormat(m.E * m.A, 0) : '—',
              ],
            })),
          materialNote:
            analysis.classification.kind === 'indeterminate'
              ? 'The truss is statically indeterminate: member forces depend on each member’s axial stiffness EA.'
              : 'The truss is statically determinate: member forces follow from equilibrium alone and do not depend on the members’ stiffness.',
        },
      },
      contents: [{ anchor: 'supports', title: 'Supports and materials' }],
    };
  },
};

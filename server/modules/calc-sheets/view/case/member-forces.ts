import { forceDiagramSvg, forceSenseOf } from '@shared/drawing/truss-svg';
import type { CasePart } from './case-context';

/** Member forces of the case: the table (tension +, compression −) and the force diagram. */
export const caseMemberForces: CasePart<'forceRows' | 'forceSvg'> = {
  build({ model, result, fmt, zeroTol, memberLength, banded }) {
    return {
      forceRows: model.members.map((m) => {
        const v = result.forces[m.id] ?? 0;
        const zero = forceSenseOf(v, zeroTol) === '0';
        return { cells: [m.tag, m.group ? m.group.replace('-', ' ') : '—', fmt.num(memberLength(m.id), 'length'), fmt.memberNum(v), fmt.sense(v)], ...(zero ? { cls: 'zero' } : {}) };
      }),
      forceSvg: banded((b) =>
        forceDiagramSvg(b.model, result.forces, {
          formatMagnitude: (kN) => fmt.num(kN, 'force'),
          zeroTolerance: zeroTol,
          label: `Member forces, case ${result.caseId}`,
        }),
      ),
    };
  },
};

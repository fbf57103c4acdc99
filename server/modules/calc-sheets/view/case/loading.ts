import { trussGeometrySvg } from '@shared/drawing/truss-svg';
import type { CasePart } from './case-context';

/** The case's loads: drawn on the truss and listed joint by joint. */
export const caseLoading: CasePart<'loadingSvg' | 'loadRows'> = {
  build({ result, loads, fmt, tags, banded }) {
    return {
      loadingSvg: banded((b) =>
        trussGeometrySvg(b.model, {
          formatLength: (m) => fmt.num(m, 'length'),
          formatForce: (kN) => fmt.qty(kN, 'force'),
          loads: loads.filter((l) => b.ownJoints.has(l.joint)),
          dimensions: false,
          memberTags: false,
          label: `Loads of case ${result.caseId}`,
        }),
      ),
      loadRows: loads.map((l) => ({ cells: [tags.joint(l.joint), fmt.num(l.fx, 'force'), fmt.num(l.fy, 'force'), l.note ?? ''] })),
    };
  },
};

import { scientificFormat } from '@shared/units';
import { RESIDUAL_RELATIVE_LIMIT, residualRatio } from '../context';
import { stepView } from '../format';
import type { CasePart } from './case-context';

/** The case's independent equilibrium check at every joint, and the mirror-symmetry note. */
export const caseEquilibriumCheck: CasePart<'check' | 'symmetryNote'> = {
  build({ analysis, result: cr, fmt }) {
    const ratio = residualRatio(cr);
    const ok = ratio <= RESIDUAL_RELATIVE_LIMIT;
    const symmetryNote =
      analysis.symmetry.detected && cr.symmetry.loadsSymmetric && cr.symmetry.maxPairDifference !== null
        ? `Geometry, supports and loads of this case are mirror-symmetric; mirrored members differ by at most ${scientificFormat(cr.symmetry.maxPairDifference, 2)} kN.`
        : undefined;
    return {
      check: {
        ...stepView(cr.check, fmt),
        ok,
        verdict: ok
          ? `Largest out-of-balance force ${scientificFormat(cr.residual, 3)} kN, ${scientificFormat(ratio, 2)} of the largest load: every joint is in equilibrium (limit ${scientificFormat(RESIDUAL_RELATIVE_LIMIT, 1)}).`
          : `Largest out-of-balance force ${scientificFormat(cr.residual, 3)} kN at joint ${cr.check.residualJointTag ?? '?'} exceeds ${scientificFormat(RESIDUAL_RELATIVE_LIMIT, 1)} of the largest load: do not use these results; report the model.`,
      },
      ...(symmetryNote ? { symmetryNote } : {}),
    };
  },
};

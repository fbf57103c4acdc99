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
        ? `Geometry, supports and loads of this case are mirror-symmetric; mirrored members differ by at most ${cr.symmetry.maxPairDifference.toExponential(1)} kN.`
        : undefined;
    return {
      check: {
        ...stepView(cr.check, fmt),
        ok,
        verdict: ok
          ? `Largest out-of-balance force ${cr.residual.toExponential(2)} kN, ${ratio.toExponential(1)} of the largest load: every joint is in equilibrium (limit ${RESIDUAL_RELATIVE_LIMIT.toExponential(0)}).`
          : `Largest out-of-balance force ${cr.residual.toExponential(2)} kN at joint ${cr.check.residualJointTag ?? '?'} exceeds ${RESIDUAL_RELATIVE_LIMIT.toExponential(0)} of the largest load: do not use these results; report the model.`,
      },
      ...(symmetryNote ? { symmetryNote } : {}),
    };
  },
};

import { stepView } from '../format';
import type { CasePart } from './case-context';

/** Zero-force members found by the two joint rules, with the rule, the joint and the pass. */
export const caseZeroForce: CasePart<'zeroForce'> = {
  build({ result, fmt, tags }) {
    return {
      zeroForce: {
        rows: result.zeroForce.map((z) => ({
          cells: [
            z.memberTag,
            z.jointTag,
            z.rule === 1 ? '1 — two non-collinear members, unloaded' : `2 — three members, ${z.collinear ? z.collinear.map(tags.member).join(' and ') : 'two'} collinear, unloaded`,
            String(z.pass),
          ],
        })),
        steps: result.zeroForce.map((z) => stepView(z, fmt)),
      },
    };
  },
};

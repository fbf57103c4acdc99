import { stepView } from '../format';
import type { CasePart } from './case-context';

/** Zero-force members seen at unloaded joints, said in plain words: why each carries nothing, and whether it was seen at once or after others were set aside. */
export const caseZeroForce: CasePart<'zeroForce'> = {
  build({ result, fmt, tags }) {
    return {
      zeroForce: {
        rows: result.zeroForce.map((z) => ({
          cells: [
            z.memberTag,
            z.jointTag,
            z.rule === 1 ? 'two members not in line meet, no load, no support' : `three members meet, ${z.collinear ? z.collinear.map(tags.member).join(' and ') : 'two'} in line, no load, no support`,
            z.pass === 1 ? 'at once' : 'once those above are set aside',
          ],
        })),
        steps: result.zeroForce.map((z) => stepView(z, fmt)),
      },
    };
  },
};

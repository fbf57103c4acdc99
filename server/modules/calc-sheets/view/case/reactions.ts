import { stepView } from '../format';
import type { CasePart } from './case-context';

/** Support reactions: the equilibrium steps, a note when they came another way, and the table. */
export const caseReactions: CasePart<'reactionSteps' | 'reactionNote' | 'reactionRows'> = {
  build({ result, fmt, stepsOf }) {
    return {
      reactionSteps: stepsOf('reaction').map((s) => stepView(s, fmt)),
      ...(result.reactionNote ? { reactionNote: result.reactionNote } : {}),
      reactionRows: result.reactions.map((r) => ({
        cells: [r.tag, r.kind === 'pin' ? 'Pin' : 'Roller', fmt.num(r.rx, 'force'), fmt.num(r.ry, 'force'), fmt.num(Math.hypot(r.rx, r.ry), 'force')],
      })),
    };
  },
};

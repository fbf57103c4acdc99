import { stepsOperandDecimals } from '@shared/solver';
import { stepView } from '../format';
import type { CasePart } from './case-context';

/** Support reactions: the equilibrium steps, a note when they came another way, and the table. */
export const caseReactions: CasePart<'reactionSteps' | 'reactionNote' | 'reactionRows'> = {
  build({ result, fmt, stepsOf }) {
    const steps = stepsOf('reaction');
    // Reactions solved together are redone together: one set of operand decimals for the group.
    const operand = stepsOperandDecimals(steps, 3);
    return {
      reactionSteps: steps.map((s) => stepView(s, fmt, operand.get(s.id))),
      ...(result.reactionNote ? { reactionNote: result.reactionNote } : {}),
      reactionRows: result.reactions.map((r) => ({
        cells: [r.tag, r.kind === 'pin' ? 'Pin' : 'Roller', fmt.num(r.rx, 'force'), fmt.num(r.ry, 'force'), fmt.num(Math.hypot(r.rx, r.ry), 'force')],
      })),
    };
  },
};

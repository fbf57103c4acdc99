import type { SheetSection } from './context';
import { caseContext, type CasePartKeys } from './case/case-context';
import { caseHeading } from './case/heading';
import { caseLoading } from './case/loading';
import { caseZeroForce } from './case/zero-force';
import { caseReactions } from './case/reactions';
import { caseJointSteps } from './case/joint-steps';
import { caseMemberForces } from './case/member-forces';
import { caseEquilibriumCheck } from './case/equilibrium-check';
import type { CaseView } from './types';

/** The parts of each load case's pages. A new part is a new file under case/ and one line here. */
const CASE_PARTS = [caseHeading, caseLoading, caseZeroForce, caseReactions, caseJointSteps, caseMemberForces, caseEquilibriumCheck] as const;

// Compile-time check that the parts fill every required field of a case's view.
type Unfilled = Exclude<keyof CaseView, CasePartKeys<(typeof CASE_PARTS)[number]>>;
const everyCaseFieldFilled: [Unfilled] extends [never] ? true : Unfilled = true;
void everyCaseFieldFilled;

/** Each load case: heading, loads, zero-force members, reactions, joint steps, member forces, check. */
export const casesSection: SheetSection<'cases'> = {
  build(ctx) {
    const cases = ctx.analysis.cases.map((result) => {
      const cc = caseContext(ctx, result);
      return Object.assign({}, ...CASE_PARTS.map((p) => p.build(cc))) as CaseView;
    });
    return {
      view: { cases },
      contents: cases.map((c) => ({ anchor: c.anchor, title: `${c.title}: zero-force members, reactions, joints, forces` })),
      summary: ctx.unstable ? [] : [{ label: 'Load cases', value: String(ctx.analysis.cases.length) }],
    };
  },
};

import { stepView } from '../format';
import type { CasePart } from './case-context';

/** The solution steps: joint by joint, any simultaneous solve, and the stiffness steps. */
export const caseJointSteps: CasePart<'jointSteps' | 'simultaneousSteps' | 'stiffnessSteps'> = {
  build({ result, fmt }) {
    return {
      jointSteps: result.jointSteps.map((s) => stepView(s, fmt)),
      simultaneousSteps: result.simultaneousSteps.map((s) => stepView(s, fmt)),
      stiffnessSteps: result.stiffnessSteps.map((s) => stepView(s, fmt)),
    };
  },
};

import type { CaseResult, SolverStep } from './types';

/**
 * All steps of one load case in reading order: zero-force findings, reactions, joints,
 * simultaneous solves, stiffness steps, and the equilibrium check.
 */
export function caseSteps(result: CaseResult): SolverStep[] {
  return [
    ...result.zeroForce,
    ...result.reactionSteps,
    ...result.jointSteps,
    ...result.simultaneousSteps,
    ...result.stiffnessSteps,
    result.check,
  ];
}

import type { JointLoad } from '@shared/model/truss';
import { caseSteps, type CaseResult, type SolverStep } from '@shared/solver';
import type { SheetContext } from '../context';
import { loadsOf } from '../format';
import type { CaseView } from '../types';

/** What each part of a load case's pages reads: the sheet's context and the case's result. */
export interface CaseContext extends SheetContext {
  result: CaseResult;
  /** The case's joint loads as modelled. */
  loads: JointLoad[];
  /** The case's solver steps of one kind, in order. */
  stepsOf(kind: SolverStep['kind']): SolverStep[];
}

export function caseContext(ctx: SheetContext, result: CaseResult): CaseContext {
  const steps = caseSteps(result);
  return { ...ctx, result, loads: loadsOf(ctx.model, result.caseId), stepsOf: (kind) => steps.filter((s) => s.kind === kind) };
}

/** One part of a load case's pages: one file under view/case/, listed once in view/cases.ts. */
export interface CasePart<K extends keyof CaseView> {
  build(ctx: CaseContext): Pick<CaseView, K>;
}

export type CasePartKeys<P> = P extends CasePart<infer K> ? K : never;

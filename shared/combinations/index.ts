export {
  COMBINATIONS_MAX,
  CombinationError,
  combinationApply,
  combinationsBuild,
  combinationsExplain,
  combinationsIgnoredCases,
} from './build';
export type { CodeCombination, CombinationErrorCode, CombinationsExplained, RuleOutcome } from './build';
export { COMBINATION_SETS, COMBINATION_SET_RULES } from './sets';
export type {
  CombinationRule,
  CombinationSet,
  CombinationSetId,
  CombinationSetInfo,
  RuleGroup,
  RuleTerm,
} from './sets';

/**
 * The truss solver's public interface (the only barrel in the repository).
 * Units: m, kN; member forces tension positive; reactions +x right, +y up.
 */
export { reactionEnvelopeBuild, reactionEnvelopeOf, trussSolve } from './solve';
export { SolverError, type SolverErrorCode } from './errors';
export {
  stepToKatex,
  stepsToKatex,
  equationToKatex,
  numberFormat,
  symbolMember,
  symbolReaction,
  symbolLoad,
  loadLetterFor,
  loadLetterOf,
  type KatexOptions,
} from './katex';
export { caseSteps } from './steps';
export { stepsOperandDecimals, MAX_EXTRA_DECIMALS } from './printed-digits';
export { texText, plainText } from '../text/safe-text';
export type * from './types';

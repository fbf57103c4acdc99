export { continuousBeamSolve, continuousBeamTributary } from './continuous-beam';
export type { ContinuousBeamResult } from './continuous-beam';
export { TakeoffError } from './errors';
export type { TakeoffErrorCode } from './errors';
export { roofTakeoff } from './roof-takeoff';
export type {
  AreaLoad,
  LoadBasis,
  RoofTakeoffInput,
  RoofTakeoffResult,
  TakeoffCase,
  TakeoffMethod,
  TakeoffPurlin,
  TakeoffPurlinCase,
} from './roof-takeoff';
export { takeoffIdPart } from './steps';
export type {
  LineLoadStep,
  PurlinBeamStep,
  PurlinReactionStep,
  PurlinWidthStep,
  TakeoffStep,
  TakeoffUnit,
  TakeoffValue,
  TributaryHalf,
} from './steps';
export { takeoffStepKatex } from './katex';
export type { TakeoffKatexOptions } from './katex';

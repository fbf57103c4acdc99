export { continuousBeamSolve, continuousBeamTributary } from './continuous-beam';
export type { ContinuousBeamResult } from './continuous-beam';
export { TAKEOFF_UNPROCESSABLE, TakeoffError } from './errors';
export type { TakeoffErrorCode } from './errors';
export { PATTERN_CATEGORIES, WIND_LIMITS, roofTakeoff } from './roof-takeoff';
export { governingSpanPattern, spanPatternLabel } from './span-patterns';
export type { SpanPattern } from './span-patterns';
export type {
  AreaLoad,
  LoadBasis,
  RoofTakeoffInput,
  RoofTakeoffResult,
  TakeoffCase,
  TakeoffMethod,
  TakeoffPurlin,
  TakeoffPurlinCase,
  TakeoffWind,
  TakeoffWindPurlin,
  WindLoad,
} from './roof-takeoff';
export { takeoffIdPart } from './steps';
export type {
  LineLoadStep,
  PurlinBeamStep,
  PurlinReactionStep,
  PurlinWidthStep,
  SpanPatternStep,
  TakeoffStep,
  TakeoffUnit,
  TakeoffValue,
  TributaryHalf,
  WindHalf,
  WindPurlinStep,
} from './steps';
export { takeoffStepKatex } from './katex';
export type { TakeoffKatexOptions } from './katex';

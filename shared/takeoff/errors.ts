/** Stable codes of the roof loading's errors; callers branch on these, never on the message. */
export type TakeoffErrorCode =
  | 'non-finite-value'
  | 'no-spans'
  | 'span-not-positive'
  | 'load-count-mismatch'
  | 'spacing-not-positive'
  | 'spacing-count-mismatch'
  | 'truss-count-too-small'
  | 'truss-index-out-of-range'
  | 'unknown-joint'
  | 'purlin-not-on-top-chord'
  | 'duplicate-purlin'
  | 'too-few-purlins'
  | 'purlins-out-of-order'
  | 'no-area-loads'
  | 'missing-load-case'
  | 'duplicate-load-case'
  | 'unknown-basis'
  | 'unknown-method'
  | 'pattern-not-allowed'
  | 'wind-without-pressure'
  | 'wind-without-coefficients'
  | 'wind-value-not-finite'
  | 'wind-pressure-out-of-range'
  | 'wind-coefficient-out-of-range'
  | 'wind-case-not-wind'
  | 'unknown-windward-side';

/**
 * The codes of input that is well-formed but cannot be taken off as asked (wind and pattern
 * loading): the API answers these 422 with the one sentence.
 */
export const TAKEOFF_UNPROCESSABLE: ReadonlySet<TakeoffErrorCode> = new Set<TakeoffErrorCode>([
  'pattern-not-allowed',
  'wind-without-pressure',
  'wind-without-coefficients',
  'wind-value-not-finite',
  'wind-pressure-out-of-range',
  'wind-coefficient-out-of-range',
  'wind-case-not-wind',
  'unknown-windward-side',
]);

/**
 * Thrown for takeoff input that cannot give a trustworthy number. The message names the
 * span, purlin, joint or load case at fault and says what to do.
 */
export class TakeoffError extends Error {
  readonly code: TakeoffErrorCode;

  constructor(code: TakeoffErrorCode, message: string) {
    super(message);
    this.name = 'TakeoffError';
    this.code = code;
  }
}

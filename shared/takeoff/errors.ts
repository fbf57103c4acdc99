/** Stable codes of the takeoff's errors; callers branch on these, never on the message. */
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
  | 'unknown-method';

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

/** Stable codes of the solver's errors; callers branch on these, never on the message. */
export type SolverErrorCode =
  | 'empty-model'
  | 'non-finite-value'
  | 'duplicate-id'
  | 'unknown-joint'
  | 'zero-length-member'
  | 'no-supports'
  | 'duplicate-support'
  | 'missing-stiffness'
  | 'unknown-load-case'
  | 'singular-system';

/**
 * Thrown for input the solver cannot turn into a trustworthy result. The message names the
 * joint, member, support, load or combination at fault and says what to do.
 */
export class SolverError extends Error {
  readonly code: SolverErrorCode;
  /** Ids of the offending joints or members, when there are any. */
  readonly ids: string[];

  constructor(code: SolverErrorCode, message: string, ids: string[] = []) {
    super(message);
    this.name = 'SolverError';
    this.code = code;
    this.ids = ids;
  }
}

/** Stable codes of the member-design errors; callers branch on these, never on the message. */
export type DesignErrorCode =
  | 'bad-section'
  | 'bad-material'
  | 'missing-section'
  | 'missing-timber-values'
  | 'unknown-grade'
  | 'unknown-combination'
  | 'unknown-joint'
  | 'bad-deflection';

/** Thrown for design input that cannot give a trustworthy check; the message is one sentence. */
export class DesignError extends Error {
  readonly code: DesignErrorCode;

  constructor(code: DesignErrorCode, message: string) {
    super(message);
    this.name = 'DesignError';
    this.code = code;
  }
}

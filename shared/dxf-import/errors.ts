/**
 * Stable codes of every refusal the drawing import can give. The upload API stores the code
 * with a failed drawing version and sends it as `error.code`; the message is for a person.
 */
export type DxfImportErrorCode =
  | 'empty-file'
  | 'binary-dxf'
  | 'dwg-file'
  | 'zip-file'
  | 'image-file'
  | 'pdf-file'
  | 'not-dxf'
  | 'truncated'
  | 'malformed'
  | 'unreadable'
  | 'units-required'
  | 'bad-option'
  | 'unknown-layer'
  | 'no-lines'
  | 'not-planar'
  | 'bad-coordinate'
  | 'coordinate-too-large'
  | 'tolerance-too-large'
  | 'block-problem'
  | 'drawing-too-large';

/**
 * The one error type the drawing import throws. `message` is a full sentence naming the
 * problem (the entity, layer or line of the file) and what to do about it; `code` is stable.
 */
export class DxfImportError extends Error {
  readonly code: DxfImportErrorCode;

  constructor(code: DxfImportErrorCode, message: string) {
    super(message);
    this.name = 'DxfImportError';
    this.code = code;
  }
}

/** True when `e` is a {@link DxfImportError} (also across bundles, by name and code). */
export function isDxfImportError(e: unknown): e is DxfImportError {
  return (
    e instanceof DxfImportError ||
    (typeof e === 'object' && e !== null && (e as Error).name === 'DxfImportError' && typeof (e as DxfImportError).code === 'string')
  );
}

import type { FieldValues, Path, UseFormSetError } from 'react-hook-form';
import { ApiError, errorMessage } from './api-client';

/**
 * Puts an API error on the form: each field error beside its field, the rest
 * as a message above the buttons (root.server).
 */
export function applyApiError<T extends FieldValues>(
  error: unknown,
  setError: UseFormSetError<T>,
  fieldNames: readonly Path<T>[],
): void {
  const known = new Set<string>(fieldNames);
  let placedOnField = false;
  if (error instanceof ApiError) {
    for (const [field, message] of Object.entries(error.fields)) {
      if (known.has(field)) {
        setError(field as Path<T>, { type: 'server', message });
        placedOnField = true;
      }
    }
  }
  // A field problem is not repeated above the buttons: a validation failure, or an error whose
  // one sentence is the one shown beside its field (a refused password).
  const onlyFieldProblems =
    placedOnField && error instanceof ApiError && (error.code === 'validation-failed' || Object.values(error.fields).includes(error.message));
  if (!onlyFieldProblems) setError('root.server', { type: 'server', message: errorMessage(error) });
}

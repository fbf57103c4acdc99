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
  const onlyFieldProblems = placedOnField && error instanceof ApiError && error.code === 'validation-failed';
  if (!onlyFieldProblems) setError('root.server', { type: 'server', message: errorMessage(error) });
}

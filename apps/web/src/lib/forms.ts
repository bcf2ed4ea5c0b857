import type { FieldValues, Path, UseFormSetError } from 'react-hook-form';
import { ApiError } from './api-client';

/**
 * Puts the server's field errors (`errors[].path`) on the matching form
 * fields. Returns the messages that belong to no field on this form, so the
 * form-level alert can still show them.
 */
export function applyServerFieldErrors<T extends FieldValues>(
  error: unknown,
  setError: UseFormSetError<T>,
  fields: readonly Path<T>[],
): string[] {
  if (!(error instanceof ApiError)) return [];
  const unmatched: string[] = [];
  let focused = false;
  for (const fieldError of error.fieldErrors) {
    const field = fields.find((name) => name === fieldError.path);
    if (field) {
      setError(field, { type: 'server', message: fieldError.message }, { shouldFocus: !focused });
      focused = true;
    } else {
      unmatched.push(fieldError.message);
    }
  }
  return unmatched;
}

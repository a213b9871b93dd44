import type { FieldPath, FieldValues, UseFormSetError } from 'react-hook-form';
import { ApiError } from './api-client';

/**
 * Puts a refused request's per-field messages on the form's fields (by the path in the body,
 * or its first part with `topLevel`, for fields that stand for a whole list). False when the
 * error named no field, so the caller shows its general message instead.
 */
export function showServerErrors<T extends FieldValues>(
  error: unknown,
  setError: UseFormSetError<T>,
  { topLevel = false } = {},
): boolean {
  if (!(error instanceof ApiError)) return false;
  const messages = Object.entries(error.fieldMessages);
  for (const [path, message] of messages)
    setError((topLevel ? path.split('.')[0]! : path) as FieldPath<T>, { message });
  return messages.length > 0;
}

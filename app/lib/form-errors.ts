import type { FieldValues, Path, UseFormSetError } from 'react-hook-form';
import { ApiError, errorMessage } from './api-client.ts';

/**
 * Puts the server's field messages under the matching fields (the first one gets focus) and
 * returns what is left over, for a banner: form-level messages or fields this form does not show.
 */
export function applyServerErrors<T extends FieldValues>(err: unknown, setError: UseFormSetError<T>, fieldNames: readonly Path<T>[]): string[] {
  if (!(err instanceof ApiError)) return [];
  const leftover: string[] = [];
  let focused = false;
  for (const [key, messages] of Object.entries(err.fields)) {
    const name = fieldNames.find((f) => f === key);
    if (name && messages.length) {
      setError(name, { type: 'server', message: messages.join(' ') }, { shouldFocus: !focused });
      focused = true;
    } else {
      leftover.push(...messages);
    }
  }
  return leftover;
}

/**
 * The whole catch block of a form: field messages under their fields, and what is left (or the
 * error's own sentence when it named no field) for the form's banner; null when nothing is left.
 */
export function formErrorsFrom<T extends FieldValues>(err: unknown, setError: UseFormSetError<T>, fieldNames: readonly Path<T>[]): string[] | null {
  const leftover = applyServerErrors(err, setError, fieldNames);
  const hadFields = err instanceof ApiError && Object.keys(err.fields).length > leftover.length;
  if (leftover.length) return leftover;
  return hadFields ? null : [errorMessage(err)];
}

import { z } from 'zod';

/** Every error the API sends has one of these codes (snake_case, like OAuth's own errors). */
export const ERROR_CODES = [
  'validation_failed',
  'unauthenticated',
  'forbidden',
  'not_found',
  'conflict',
  'payload_too_large',
  'unsupported_media_type',
  'rate_limited',
  'unavailable',
  'internal',
] as const;
export type ErrorCode = (typeof ERROR_CODES)[number];

export const ERROR_STATUS: Record<ErrorCode, number> = {
  validation_failed: 400,
  unauthenticated: 401,
  forbidden: 403,
  not_found: 404,
  conflict: 409,
  payload_too_large: 413,
  unsupported_media_type: 415,
  rate_limited: 429,
  unavailable: 503,
  internal: 500,
};

/** Field messages keyed by dotted path ("email", "questions.2.label"); "" holds form-level messages. */
export const FieldErrorsSchema = z.record(z.string(), z.array(z.string()));
export type FieldErrors = z.infer<typeof FieldErrorsSchema>;

/** The one reply shape for every failed request. */
export const ErrorBodySchema = z.object({
  error: z.object({
    code: z.enum(ERROR_CODES),
    message: z.string(),
    details: z.object({ fields: FieldErrorsSchema.optional() }).catchall(z.unknown()).optional(),
  }),
});
export type ErrorBody = z.infer<typeof ErrorBodySchema>;

/** Turns zod issues into field messages, so client and server show the same words. */
export function fieldErrorsFromIssues(issues: readonly z.core.$ZodIssue[]): FieldErrors {
  // A Map, not an object: a field named "constructor" or "__proto__" must not meet Object.prototype.
  const out = new Map<string, string[]>();
  for (const issue of issues) {
    const key = issue.path.map(String).join('.');
    out.set(key, [...(out.get(key) ?? []), issue.message]);
  }
  return Object.fromEntries(out);
}

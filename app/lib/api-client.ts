import type { z } from 'zod';
import { ErrorBodySchema, type ErrorCode, type FieldErrors } from '#shared/errors.ts';

/** A failed API call, carrying the server's error shape so screens can show its words. */
export class ApiError extends Error {
  override readonly name = 'ApiError';
  constructor(
    /** HTTP status; 0 when the server could not be reached at all. */
    readonly status: number,
    readonly code: ErrorCode,
    message: string,
    /** Field messages keyed by dotted path; "" holds form-level messages. */
    readonly fields: FieldErrors = {},
    readonly details: Record<string, unknown> = {},
  ) {
    super(message);
  }

  get isClientError(): boolean {
    return this.status >= 400 && this.status < 500;
  }
}

export function isApiError(err: unknown, status?: number): err is ApiError {
  return err instanceof ApiError && (status === undefined || err.status === status);
}

// When a proxy or a crash answers without our JSON shape, still give the person a sentence.
const FALLBACK: Record<number, { code: ErrorCode; message: string }> = {
  400: { code: 'validation_failed', message: 'The request was not accepted.' },
  401: { code: 'unauthenticated', message: 'Sign in to continue.' },
  403: { code: 'forbidden', message: 'You do not have permission to do that.' },
  404: { code: 'not_found', message: 'That was not found.' },
  409: { code: 'conflict', message: 'Someone else changed this. Reload to see their change.' },
  413: { code: 'payload_too_large', message: 'That is larger than allowed.' },
  429: { code: 'rate_limited', message: 'Too many requests. Wait a moment and try again.' },
  503: { code: 'unavailable', message: 'Plinth is not available right now. Try again in a moment.' },
};

async function toApiError(res: Response): Promise<ApiError> {
  let body: unknown = null;
  try {
    body = await res.json();
  } catch {
    // Not JSON (e.g. a gateway page); fall through to the status-based sentence.
  }
  return apiErrorFrom(res.status, body);
}

/** The ApiError for a failed reply's status and (parsed JSON) body; also used by uploads sent with XMLHttpRequest. */
export function apiErrorFrom(status: number, body: unknown): ApiError {
  const parsed = ErrorBodySchema.safeParse(body);
  if (parsed.success) {
    const { code, message, details } = parsed.data.error;
    const { fields, ...rest } = details ?? {};
    return new ApiError(status, code, message, fields ?? {}, rest);
  }
  const fallback = FALLBACK[status] ?? { code: 'internal' as const, message: 'Something went wrong on the server.' };
  return new ApiError(status, fallback.code, fallback.message);
}

export type QueryValue = string | number | boolean | null | undefined;

/** Builds "path?a=1&b=2", leaving out empty values so URLs and cache keys stay short. */
export function withQuery(path: string, query: Record<string, QueryValue> = {}): string {
  const params = new URLSearchParams();
  for (const [key, value] of Object.entries(query)) {
    if (value === undefined || value === null || value === '') continue;
    params.set(key, String(value));
  }
  const qs = params.toString();
  return qs ? `${path}?${qs}` : path;
}

interface RequestOptions<T> {
  method?: 'GET' | 'POST' | 'PUT' | 'PATCH' | 'DELETE';
  body?: unknown;
  /** The shared zod schema of the reply; parsing it keeps the client honest about the contract. */
  schema?: z.ZodType<T>;
  signal?: AbortSignal;
}

/** JSON over same-origin fetch; every failure becomes an ApiError. */
export async function apiRequest<T = unknown>(path: string, options: RequestOptions<T> = {}): Promise<T> {
  const { method = 'GET', body, schema, signal } = options;
  const headers: Record<string, string> = { Accept: 'application/json' };
  if (body !== undefined) headers['Content-Type'] = 'application/json';
  let res: Response;
  try {
    res = await fetch(path, {
      method,
      headers,
      credentials: 'same-origin',
      body: body === undefined ? undefined : JSON.stringify(body),
      signal,
    });
  } catch (err) {
    if (signal?.aborted) throw err;
    throw new ApiError(0, 'unavailable', 'Plinth could not reach its server. Check the connection and try again.');
  }
  if (!res.ok) throw await toApiError(res);
  if (res.status === 204) return undefined as T;
  const data: unknown = await res.json();
  if (!schema) return data as T;
  const parsed = schema.safeParse(data);
  if (!parsed.success) {
    throw new ApiError(res.status, 'internal', 'The server replied in a shape this page does not understand. Reload the page.');
  }
  return parsed.data;
}

export const api = {
  get: <T>(path: string, schema?: z.ZodType<T>, signal?: AbortSignal) => apiRequest<T>(path, { schema, signal }),
  post: <T>(path: string, body: unknown, schema?: z.ZodType<T>) => apiRequest<T>(path, { method: 'POST', body, schema }),
  put: <T>(path: string, body: unknown, schema?: z.ZodType<T>) => apiRequest<T>(path, { method: 'PUT', body, schema }),
  patch: <T>(path: string, body: unknown, schema?: z.ZodType<T>) => apiRequest<T>(path, { method: 'PATCH', body, schema }),
  delete: <T>(path: string, schema?: z.ZodType<T>) => apiRequest<T>(path, { method: 'DELETE', schema }),
};

/** The sentence to show for any thrown value. */
export function errorMessage(err: unknown): string {
  if (err instanceof ApiError) return err.message;
  if (err instanceof Error && err.message) return err.message;
  return 'Something went wrong.';
}

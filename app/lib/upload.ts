import { useCallback, useEffect, useRef, useState } from 'react';
import type { z } from 'zod';
import { ApiError, apiErrorFrom } from './api-client.ts';

export interface UploadOptions<T> {
  url: string;
  method?: 'POST' | 'PUT';
  /** The multipart field the API reads the file from ("file", "portrait"). */
  field: string;
  file: File;
  /** Text fields sent before the file (a record's version, say). */
  fields?: Record<string, string>;
  schema?: z.ZodType<T>;
  /** Fraction sent so far, 0 to 1. */
  onProgress?: (fraction: number) => void;
  signal?: AbortSignal;
}

/**
 * Sends one file as multipart/form-data with XMLHttpRequest, whose upload events report real
 * progress (fetch cannot yet). Failures become the same ApiError every other call throws.
 */
export function uploadFile<T = unknown>({ url, method = 'POST', field, file, fields = {}, schema, onProgress, signal }: UploadOptions<T>): Promise<T> {
  return new Promise<T>((resolve, reject) => {
    const xhr = new XMLHttpRequest();
    xhr.open(method, url);
    xhr.responseType = 'text';
    xhr.setRequestHeader('Accept', 'application/json');
    xhr.withCredentials = true;
    xhr.upload.addEventListener('progress', (e) => {
      if (e.lengthComputable && e.total > 0) onProgress?.(e.loaded / e.total);
    });
    xhr.addEventListener('load', () => {
      let body: unknown = null;
      try {
        body = xhr.responseText ? JSON.parse(xhr.responseText) : null;
      } catch {
        // Not JSON: the status-based sentence follows.
      }
      if (xhr.status < 200 || xhr.status >= 300) return reject(apiErrorFrom(xhr.status, body));
      onProgress?.(1);
      if (xhr.status === 204 || !schema) return resolve(body as T);
      const parsed = schema.safeParse(body);
      if (!parsed.success) {
        return reject(new ApiError(xhr.status, 'internal', 'The server replied in a shape this page does not understand. Reload the page.'));
      }
      resolve(parsed.data);
    });
    xhr.addEventListener('error', () => reject(new ApiError(0, 'unavailable', 'The upload did not reach Plinth. Check the connection and try again.')));
    xhr.addEventListener('abort', () => reject(new DOMException('The upload was stopped.', 'AbortError')));
    signal?.addEventListener('abort', () => xhr.abort(), { once: true });
    const form = new FormData();
    for (const [name, value] of Object.entries(fields)) form.append(name, value);
    form.append(field, file, file.name);
    xhr.send(form);
  });
}

export type UploadState<T> =
  | { status: 'idle' }
  | { status: 'uploading'; progress: number; fileName: string }
  | { status: 'done'; data: T }
  | { status: 'error'; error: unknown };

/** An upload with its progress as state; a new upload, or leaving the page, stops the one under way. */
export function useUpload<T>() {
  const [state, setState] = useState<UploadState<T>>({ status: 'idle' });
  const controller = useRef<AbortController | null>(null);

  useEffect(() => () => controller.current?.abort(), []);

  const start = useCallback(async (options: Omit<UploadOptions<T>, 'onProgress' | 'signal'>): Promise<T> => {
    controller.current?.abort();
    const ac = new AbortController();
    controller.current = ac;
    setState({ status: 'uploading', progress: 0, fileName: options.file.name });
    try {
      const data = await uploadFile<T>({
        ...options,
        signal: ac.signal,
        onProgress: (progress) => {
          if (!ac.signal.aborted) setState({ status: 'uploading', progress, fileName: options.file.name });
        },
      });
      if (!ac.signal.aborted) setState({ status: 'done', data });
      return data;
    } catch (error) {
      if (!ac.signal.aborted) setState({ status: 'error', error });
      throw error;
    }
  }, []);

  const reset = useCallback(() => {
    controller.current?.abort();
    controller.current = null;
    setState({ status: 'idle' });
  }, []);

  return { state, start, reset, uploading: state.status === 'uploading' } as const;
}

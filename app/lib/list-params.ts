import { useEffect, useRef, useState } from 'react';
import { useSearchParams } from 'react-router-dom';
import type { z } from 'zod';

/**
 * Reads a paged table's state (q, page, sort, dir, filters) from the URL through the API's own
 * query schema, so a shared link, the route loader and the page all ask for the same thing.
 * A hand-edited bad value is dropped rather than breaking the page.
 */
export function parseListParams<S extends z.ZodObject>(schema: S, params: URLSearchParams): z.output<S> {
  const raw: Record<string, string> = {};
  for (const [k, v] of params) if (k in schema.shape && v !== '') raw[k] = v;
  for (let attempt = 0; attempt < 5; attempt++) {
    const result = schema.safeParse(raw);
    if (result.success) return result.data;
    for (const issue of result.error.issues) delete raw[String(issue.path[0])];
  }
  return schema.parse({});
}

/** Writes changes back to the URL; defaults are left out so plain links stay plain. */
export function useListParams<S extends z.ZodObject>(schema: S) {
  const [params, setParams] = useSearchParams();
  const value = parseListParams(schema, params);
  const defaults = schema.parse({}) as Record<string, unknown>;

  // Typing and filtering replace the history entry; paging pushes one, so Back returns to the last page.
  function update(patch: Partial<z.output<S>>, options: { resetPage?: boolean; push?: boolean } = {}) {
    setParams(
      (prev) => {
        const next = new URLSearchParams(prev);
        for (const [k, v] of Object.entries(patch)) {
          if (v === undefined || v === null || v === '' || v === defaults[k]) next.delete(k);
          else next.set(k, String(v));
        }
        if (options.resetPage) next.delete('page');
        return next;
      },
      { replace: !options.push },
    );
  }

  return [value, update] as const;
}

/**
 * A search box that updates the URL only after typing pauses, so each keystroke is not a request.
 * Back/forward navigation still refills the box.
 */
export function useDebouncedSearch(urlValue: string, commit: (value: string) => void, delayMs = 300) {
  const [text, setText] = useState(urlValue);
  const lastCommitted = useRef(urlValue);
  // The latest commit function, without restarting the debounce timer when it changes identity.
  const commitRef = useRef(commit);
  useEffect(() => {
    commitRef.current = commit;
  });

  useEffect(() => {
    if (urlValue !== lastCommitted.current) {
      lastCommitted.current = urlValue;
      setText(urlValue);
    }
  }, [urlValue]);

  useEffect(() => {
    const trimmed = text.trim();
    if (trimmed === lastCommitted.current) return;
    const timer = window.setTimeout(() => {
      lastCommitted.current = trimmed;
      commitRef.current(trimmed);
    }, delayMs);
    return () => window.clearTimeout(timer);
  }, [text, delayMs]);

  return [text, setText] as const;
}

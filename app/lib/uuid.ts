/** A random v4 UUID; crypto.randomUUID where the page is a secure context, the same from getRandomValues elsewhere. */
export function randomUuid(): string {
  if (typeof crypto.randomUUID === 'function') return crypto.randomUUID();
  const b = crypto.getRandomValues(new Uint8Array(16));
  b[6] = (b[6]! & 0x0f) | 0x40;
  b[8] = (b[8]! & 0x3f) | 0x80;
  const hex = [...b].map((x) => x.toString(16).padStart(2, '0')).join('');
  return `${hex.slice(0, 8)}-${hex.slice(8, 12)}-${hex.slice(12, 16)}-${hex.slice(16, 20)}-${hex.slice(20)}`;
}

/**
 * The submission key for one signing link in this tab: made once, then kept in sessionStorage so
 * a retry or a reload sends the same key and the server makes one consent, never two.
 */
export function signingKeyFor(token: string): string {
  const storageKey = `plinth:signing-key:${token}`;
  try {
    const kept = window.sessionStorage.getItem(storageKey);
    if (kept && /^[0-9a-f-]{36}$/i.test(kept)) return kept;
    const made = randomUuid();
    window.sessionStorage.setItem(storageKey, made);
    return made;
  } catch {
    // Storage switched off (private mode in some browsers): the key lives as long as the page.
    return randomUuid();
  }
}

export function forgetSigningKey(token: string): void {
  try {
    window.sessionStorage.removeItem(`plinth:signing-key:${token}`);
  } catch {
    // Nothing was kept.
  }
}

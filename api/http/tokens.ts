import { createHash, randomBytes } from 'node:crypto';

/** A one-time link token: 256 random bits, URL-safe. Only its hash is stored. */
export function newToken(): string {
  return randomBytes(32).toString('base64url');
}

export function hashToken(token: string): string {
  return createHash('sha256').update(token).digest('hex');
}

/** The shape every one-time token in a path has; anything else is refused before a lookup. */
export const TOKEN_PATTERN = /^[A-Za-z0-9_-]{40,60}$/;

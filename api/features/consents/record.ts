import { createHash } from 'node:crypto';

/** JSON with object keys in sorted order at every depth, so the same record always hashes the same. */
export function canonicalJson(value: unknown): string {
  if (value === null || typeof value !== 'object') return JSON.stringify(value);
  if (Array.isArray(value)) return `[${value.map(canonicalJson).join(',')}]`;
  const entries = Object.entries(value as Record<string, unknown>)
    .filter(([, v]) => v !== undefined)
    .sort(([a], [b]) => (a < b ? -1 : a > b ? 1 : 0));
  return `{${entries.map(([k, v]) => `${JSON.stringify(k)}:${canonicalJson(v)}`).join(',')}}`;
}

export interface SignedContent {
  consentId: string;
  performerId: string;
  performerName: string;
  templateVersionId: string;
  templateVersion: number;
  kind: string;
  title: string;
  body: string;
  answers: { questionId: string; label: string; medical: boolean; answer: boolean | string | null }[];
  signerName: string;
  signedAt: string;
  signingMethod: 'tablet' | 'link';
  ip: string | null;
  userAgent: string | null;
  signatureSha256: string;
}

/** The SHA-256 printed in the consent PDF's footer: over exactly what was shown, answered and signed. */
export function contentSha256(content: SignedContent): string {
  return createHash('sha256').update(canonicalJson(content)).digest('hex');
}

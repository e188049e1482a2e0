import { createHash } from 'node:crypto';
import { describe, expect, it } from 'vitest';
import { canonicalJson, contentSha256, type SignedContent } from '../../api/features/consents/record.ts';

describe('canonicalJson', () => {
  it('orders keys at every depth, so equal records serialise identically', () => {
    expect(canonicalJson({ b: 1, a: { d: [2, { z: 1, y: 2 }], c: null } })).toBe('{"a":{"c":null,"d":[2,{"y":2,"z":1}]},"b":1}');
    expect(canonicalJson({ a: 1, b: 2 })).toBe(canonicalJson({ b: 2, a: 1 }));
  });
  it('round-trips through JSON.parse', () => {
    const v = { x: 'é "quoted"', n: [1, 2.5, true] };
    expect(JSON.parse(canonicalJson(v))).toEqual(v);
  });
});

describe('contentSha256', () => {
  it('is SHA-256 over the canonical JSON (checked against the FIPS 180-2 "abc" vector for the hash itself)', () => {
    // FIPS 180-2, Appendix B.1: SHA-256("abc").
    expect(createHash('sha256').update('abc').digest('hex')).toBe('ba7816bf8f01cfea414140de5dae2223b00361a396177a9cb410ff61f20015ad');
    const content: SignedContent = {
      consentId: 'c', performerId: 'p', performerName: 'N', templateVersionId: 'v', templateVersion: 1, kind: 'application', title: 'T', body: 'B',
      answers: [], signerName: 'N', signedAt: '2026-01-01T00:00:00.000Z', signingMethod: 'tablet', ip: null, userAgent: null, signatureSha256: 's',
    };
    expect(contentSha256(content)).toBe(createHash('sha256').update(canonicalJson(content)).digest('hex'));
    expect(contentSha256({ ...content, body: 'B2' })).not.toBe(contentSha256(content));
  });
});

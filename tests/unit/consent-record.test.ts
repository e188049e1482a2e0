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
  it('is the SHA-256 of exactly the canonical text: keys sorted at every depth, no spaces', () => {
    const content: SignedContent = {
      consentId: 'c', performerId: 'p', performerName: 'N', templateVersionId: 'v', templateVersion: 1, kind: 'application', title: 'T', body: 'B',
      answers: [], signerName: 'N', signedAt: '2026-01-01T00:00:00.000Z', signingMethod: 'tablet', ip: null, userAgent: null, signatureSha256: 's',
    };
    // The canonical text written out by hand (sorted keys, no whitespace), hashed independently of canonicalJson().
    const byHand =
      '{"answers":[],"body":"B","consentId":"c","ip":null,"kind":"application","performerId":"p","performerName":"N","signatureSha256":"s",' +
      '"signedAt":"2026-01-01T00:00:00.000Z","signerName":"N","signingMethod":"tablet","templateVersion":1,"templateVersionId":"v","title":"T","userAgent":null}';
    expect(contentSha256(content)).toBe(createHash('sha256').update(byHand, 'utf8').digest('hex'));
    expect(contentSha256({ ...content, body: 'B2' })).not.toBe(contentSha256(content));
  });
});

import { mkdtempSync, statSync } from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { describe, expect, it } from 'vitest';
import { installKeyring, keyringOf, loadOrCreateKeyFile, openBytes, openJson, sealBytes, sealedWith, sealJson } from '../../api/crypto/medical.ts';

const A = Buffer.alloc(32, 1).toString('base64');
const B = Buffer.alloc(32, 2).toString('base64');

describe('sealing health details (AES-256-GCM)', () => {
  it('round-trips values and files, and never shows the plain text', () => {
    installKeyring(keyringOf(A));
    const sealed = sealJson('Reacted to latex gloves');
    expect(sealed).not.toContain('latex');
    expect(openJson(sealed)).toBe('Reacted to latex gloves');
    // A fresh IV each time: the same answer never seals to the same text.
    expect(sealJson('Reacted to latex gloves')).not.toBe(sealed);
    const pdf = Buffer.from('%PDF-1.7 health answers');
    const file = sealBytes(pdf);
    expect(file.includes(Buffer.from('health'))).toBe(false);
    expect(openBytes(file).equals(pdf)).toBe(true);
  });

  it('refuses a value altered at rest (the GCM tag no longer matches)', () => {
    installKeyring(keyringOf(A));
    const sealed = sealJson('none');
    const parts = sealed.split(':');
    const data = Buffer.from(parts.at(-1)!, 'base64url');
    data[0] = data[0]! ^ 1;
    parts[parts.length - 1] = data.toString('base64url');
    expect(() => openJson(parts.join(':'))).toThrow();
  });

  it('opens values sealed under a previous key while a rotation is under way, and not without it', () => {
    installKeyring(keyringOf(A));
    const old = sealJson('x');
    installKeyring(keyringOf(B, [A]));
    expect(openJson(old)).toBe('x');
    expect(sealedWith(sealJson('y'))).not.toBe(sealedWith(old));
    installKeyring(keyringOf(B));
    expect(() => openJson(old)).toThrow(/does not hold/);
  });

  it('values written before sealing existed read back as they were', () => {
    expect(openJson(true)).toBe(true);
    expect(openJson('plain')).toBe('plain');
  });

  it('a first start writes the key file readable by its owner only, and later starts reuse it', () => {
    const file = path.join(mkdtempSync(path.join(os.tmpdir(), 'plinth-k-')), '.data', 'medical-data.key');
    const key = loadOrCreateKeyFile(file, true)!;
    expect(Buffer.from(key, 'base64')).toHaveLength(32);
    expect(statSync(file).mode & 0o777).toBe(0o600);
    expect(loadOrCreateKeyFile(file, true)).toBe(key);
    expect(loadOrCreateKeyFile(path.join(path.dirname(file), 'none.key'), false)).toBeNull();
  });

  it('opens a short value once and answers it again from memory, but forgets everything when the keys change', () => {
    installKeyring(keyringOf(A));
    const code = sealJson('++');
    expect(openJson(code)).toBe('++');
    expect(openJson(code)).toBe('++');
    // An object is opened afresh each time: a caller changing one cannot change what another reads.
    const answers = sealJson({ allergies: 'latex' });
    const first = openJson<{ allergies: string }>(answers);
    first.allergies = 'changed';
    expect(openJson(answers)).toEqual({ allergies: 'latex' });
    // New keys without the old one: the value opened a moment ago no longer opens, from memory or otherwise.
    installKeyring(keyringOf(B));
    expect(() => openJson(code)).toThrow(/does not hold/);
  });
});

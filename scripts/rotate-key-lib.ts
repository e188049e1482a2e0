// Rotating the medical data key: every sealed value and file sealed again under the new key, the old key dropped.
import { randomBytes } from 'node:crypto';
import { existsSync } from 'node:fs';
import { readFile, rename, rm, writeFile } from 'node:fs/promises';
import { previousKeyFile } from '../api/crypto/medical-keys.ts';
import { installKeyring, keyringOf } from '../api/crypto/medical.ts';
import { resealAll } from '../api/crypto/reseal.ts';
import type { Db } from '../api/db/index.ts';
import type { FileStore } from '../api/files/store.ts';

export interface RotationReport {
  values: number;
  files: number;
  keyId: string;
}

async function writeSecret(file: string, text: string): Promise<void> {
  const tmp = `${file}.${randomBytes(4).toString('hex')}.part`;
  await writeFile(tmp, text, { mode: 0o600, flag: 'wx' });
  await rename(tmp, file);
}

/**
 * The key file (`.data/medical-data.key`): run with the app stopped. The new key is `newKey` when
 * given, else drawn here. The old key is kept beside the new one (`<key file>.previous`) until
 * everything is sealed again, so a rotation cut short can be run once more and loses nothing.
 */
export async function rotateMedicalKey(opts: { db: Db; files: FileStore; keyFile: string; newKey?: string }): Promise<RotationReport> {
  const old = (await readFile(opts.keyFile, 'utf8')).trim();
  const prevFile = previousKeyFile(opts.keyFile);
  const previous = existsSync(prevFile) ? (await readFile(prevFile, 'utf8')).split('\n').map((l) => l.trim()).filter(Boolean) : [];
  const next = opts.newKey?.trim() ?? randomBytes(32).toString('base64');
  if (next === old) throw new Error('The new medical data key is the key in use: give another one.');
  // Checked before anything is written: a malformed new key throws here.
  const ring = keyringOf(next, [old, ...previous]);
  await writeSecret(prevFile, [...new Set([old, ...previous])].join('\n') + '\n');
  await writeSecret(opts.keyFile, `${next}\n`);
  installKeyring(ring);
  const report = await resealAll(opts.db, opts.files);
  // Everything is under the new key: the old one goes.
  await rm(prevFile, { force: true });
  installKeyring(keyringOf(next));
  return { ...report, keyId: ring.current.id };
}

/**
 * A key given in the environment (`MEDICAL_DATA_KEY`, the new one in `MEDICAL_DATA_KEY_NEW`): run
 * with the app stopped, then start every process with MEDICAL_DATA_KEY set to the new key. Both keys
 * open values while it runs, so a rotation cut short is run again with the same two keys.
 */
export async function rotateMedicalKeyFromEnv(opts: { db: Db; files: FileStore; oldKey: string; newKey: string }): Promise<RotationReport> {
  if (opts.newKey.trim() === opts.oldKey.trim()) throw new Error('MEDICAL_DATA_KEY_NEW is the key in use: give another one.');
  const ring = keyringOf(opts.newKey, [opts.oldKey]);
  installKeyring(ring);
  const report = await resealAll(opts.db, opts.files);
  installKeyring(keyringOf(opts.newKey));
  return { ...report, keyId: ring.current.id };
}

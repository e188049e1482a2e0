import { createCipheriv, createDecipheriv, createHash, randomBytes } from 'node:crypto';
import { chmodSync, existsSync, mkdirSync, readFileSync, writeFileSync } from 'node:fs';
import path from 'node:path';
import { LRUCache } from 'lru-cache';

/**
 * Health details at rest: AES-256-GCM with a key that never enters the database or a backup.
 * A sealed value names its key by a short id, so values sealed under the previous key still open
 * while a rotation is under way.
 */

const TEXT_PREFIX = 'sealed:v1:';
const FILE_MAGIC = Buffer.from('PLNTSEAL1');

export interface Keyring {
  current: { id: string; key: Buffer };
  previous: { id: string; key: Buffer }[];
}

function keyId(key: Buffer): string {
  return createHash('sha256').update(key).digest('hex').slice(0, 12);
}

function toKey(raw: string): Buffer {
  const key = Buffer.from(raw.trim(), 'base64');
  if (key.length !== 32) throw new Error('A medical data key must be 32 bytes, base64-encoded (for example: openssl rand -base64 32).');
  return key;
}

export function keyringOf(current: string, previous: readonly string[] = []): Keyring {
  const k = toKey(current);
  return { current: { id: keyId(k), key: k }, previous: previous.map((p) => toKey(p)).map((key) => ({ id: keyId(key), key })) };
}

let installed: Keyring | null = null;

/**
 * Short sealed values opened before (a reading's code, a grade): a sealed text always opens to the same
 * value, so a clearance over thousands of readings need not run the cipher for each one on every request.
 * Only primitives are kept (nothing a caller could change under another), only in this process's memory,
 * and all are forgotten when the keys change.
 */
const SHORT_SEALED = 200;
const opened = new LRUCache<string, { value: string | number | boolean | null }>({ max: 100_000 });

/** Sets the keys this process seals and opens health details with (once, at start-up). */
export function installKeyring(ring: Keyring): void {
  installed = ring;
  opened.clear();
}

function ring(): Keyring {
  if (!installed) throw new Error('No medical data key is installed: the app seals health details at rest and cannot start without one.');
  return installed;
}

/** The id of the key new seals are made with. */
export function currentKeyId(): string {
  return ring().current.id;
}

function keyFor(id: string): Buffer {
  const r = ring();
  if (r.current.id === id) return r.current.key;
  const old = r.previous.find((p) => p.id === id);
  if (!old) throw new Error(`A health detail is sealed with a key this process does not hold (${id}).`);
  return old.key;
}

function seal(plain: Buffer): { id: string; iv: Buffer; tag: Buffer; data: Buffer } {
  const { id, key } = ring().current;
  const iv = randomBytes(12);
  const cipher = createCipheriv('aes-256-gcm', key, iv);
  const data = Buffer.concat([cipher.update(plain), cipher.final()]);
  return { id, iv, tag: cipher.getAuthTag(), data };
}

function open(id: string, iv: Buffer, tag: Buffer, data: Buffer): Buffer {
  const decipher = createDecipheriv('aes-256-gcm', keyFor(id), iv);
  decipher.setAuthTag(tag);
  return Buffer.concat([decipher.update(data), decipher.final()]);
}

/** A JSON value sealed into one string: `sealed:v1:<key id>:<iv>:<tag>:<data>`, base64url parts. */
export function sealJson(value: unknown): string {
  const s = seal(Buffer.from(JSON.stringify(value), 'utf8'));
  return `${TEXT_PREFIX}${s.id}:${s.iv.toString('base64url')}:${s.tag.toString('base64url')}:${s.data.toString('base64url')}`;
}

export function isSealed(value: unknown): value is string {
  return typeof value === 'string' && value.startsWith(TEXT_PREFIX);
}

/** Opens a sealed value; a value stored before sealing existed comes back as it is. */
export function openJson<T = unknown>(value: unknown): T {
  if (!isSealed(value)) return value as T;
  const short = value.length <= SHORT_SEALED;
  const known = short ? opened.get(value) : undefined;
  if (known) return known.value as T;
  const [id, iv, tag, data] = value.slice(TEXT_PREFIX.length).split(':');
  const plain: unknown = JSON.parse(open(id!, Buffer.from(iv!, 'base64url'), Buffer.from(tag!, 'base64url'), Buffer.from(data!, 'base64url')).toString('utf8'));
  if (short && (plain === null || typeof plain !== 'object')) opened.set(value, { value: plain as string | number | boolean | null });
  return plain as T;
}

/** File bytes sealed: magic, key id (12 bytes), iv, tag, data. */
export function sealBytes(plain: Buffer): Buffer {
  const s = seal(plain);
  return Buffer.concat([FILE_MAGIC, Buffer.from(s.id, 'latin1'), s.iv, s.tag, s.data]);
}

export function isSealedBytes(bytes: Buffer): boolean {
  return bytes.subarray(0, FILE_MAGIC.length).equals(FILE_MAGIC);
}

export function openBytes(bytes: Buffer): Buffer {
  if (!isSealedBytes(bytes)) return bytes;
  let at = FILE_MAGIC.length;
  const id = bytes.subarray(at, (at += 12)).toString('latin1');
  const iv = bytes.subarray(at, (at += 12));
  const tag = bytes.subarray(at, (at += 16));
  return open(id, iv, tag, bytes.subarray(at));
}

/** The key id a sealed value or file was sealed with (for rotation), or null if it is not sealed. */
export function sealedWith(value: string | Buffer): string | null {
  if (typeof value === 'string') return isSealed(value) ? value.slice(TEXT_PREFIX.length).split(':')[0]! : null;
  return isSealedBytes(value) ? value.subarray(FILE_MAGIC.length, FILE_MAGIC.length + 12).toString('latin1') : null;
}

/**
 * The key for a local start: MEDICAL_DATA_KEY when given, else the key file under .data/, written
 * with mode 0600 on first use. A production start with neither is refused by the caller.
 */
export function loadOrCreateKeyFile(file: string, create: boolean): string | null {
  if (existsSync(file)) return readFileSync(file, 'utf8').trim();
  if (!create) return null;
  mkdirSync(path.dirname(file), { recursive: true });
  const key = randomBytes(32).toString('base64');
  writeFileSync(file, `${key}\n`, { mode: 0o600, flag: 'wx' });
  chmodSync(file, 0o600);
  return key;
}

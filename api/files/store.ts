import { createHash, randomUUID } from 'node:crypto';
import { promises as fs } from 'node:fs';
import path from 'node:path';
import { openBytes, sealBytes } from '../crypto/medical.ts';
import type { Db } from '../db/index.ts';

export interface StoredFile {
  id: string;
  contentType: string;
  byteSize: number;
  sha256: string;
  storagePath: string;
}

export function sha256Hex(buf: Buffer | Uint8Array): string {
  return createHash('sha256').update(buf).digest('hex');
}

/**
 * The only writer to storage/: bytes go to <storage>/<purpose>/<id>.<ext> (never a name from the
 * request), written to a temporary name and renamed, then recorded in `files`. Pass the
 * transaction so the row and the record that points at it commit together.
 */
export async function storeFile(
  db: Db,
  storageDir: string,
  file: {
    purpose: string;
    contentType: string;
    ext: string;
    bytes: Buffer;
    width?: number | null;
    height?: number | null;
    createdBy?: string | null;
    /** Health details: the bytes on disk are sealed with the medical data key (readStoredFile opens them). */
    sealed?: boolean;
  },
): Promise<StoredFile> {
  if (!/^[a-z_]+$/.test(file.purpose) || !/^[a-z0-9]+$/.test(file.ext)) throw new Error('bad file purpose or extension');
  const id = randomUUID();
  const rel = path.join(file.purpose, `${id}.${file.ext}`);
  const abs = path.join(storageDir, rel);
  await fs.mkdir(path.dirname(abs), { recursive: true });
  const tmp = `${abs}.part`;
  await fs.writeFile(tmp, file.sealed ? sealBytes(file.bytes) : file.bytes, { flag: 'wx' });
  await fs.rename(tmp, abs);
  const sha256 = sha256Hex(file.bytes);
  await db
    .insertInto('files')
    .values({
      id,
      purpose: file.purpose,
      content_type: file.contentType,
      byte_size: file.bytes.length,
      sha256,
      storage_path: rel,
      width: file.width ?? null,
      height: file.height ?? null,
      created_by: file.createdBy ?? null,
    })
    .execute();
  return { id, contentType: file.contentType, byteSize: file.bytes.length, sha256, storagePath: rel };
}

/** Removes bytes written for a request whose transaction then failed, so nothing is half-saved. */
export async function discardFiles(storageDir: string, files: readonly Pick<StoredFile, 'storagePath'>[]): Promise<void> {
  await Promise.all(files.map((f) => fs.rm(path.join(storageDir, f.storagePath), { force: true })));
}

export async function readStoredFile(db: Db, storageDir: string, id: string): Promise<{ bytes: Buffer; contentType: string; sha256: string } | null> {
  const row = await db.selectFrom('files').select(['storage_path', 'content_type', 'sha256']).where('id', '=', id).executeTakeFirst();
  if (!row) return null;
  const abs = path.resolve(storageDir, row.storage_path);
  if (!abs.startsWith(path.resolve(storageDir) + path.sep)) return null;
  try {
    // Sealed files open transparently; the recorded SHA-256 is always of the plain bytes.
    return { bytes: openBytes(await fs.readFile(abs)), contentType: row.content_type, sha256: row.sha256 };
  } catch (err) {
    if ((err as NodeJS.ErrnoException).code === 'ENOENT') return null;
    throw err;
  }
}

import { createHash, randomUUID } from 'node:crypto';
import { openBytes, sealBytes } from '../crypto/medical.ts';
import type { Db } from '../db/index.ts';
import type { FileStore } from './drivers.ts';

export { createFileStore, type FileStore } from './drivers.ts';

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
 * The only writer of stored files: bytes go to the store (disk or bucket) under
 * <purpose>/<id>.<ext> (never a name from the request), then are recorded in `files`. Pass the
 * transaction so the row and the record that points at it commit together.
 */
export async function storeFile(
  db: Db,
  store: FileStore,
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
  const rel = `${file.purpose}/${id}.${file.ext}`;
  // A sealed file is sealed before it leaves the process: the bucket or disk only ever holds ciphertext.
  await store.put(rel, file.sealed ? sealBytes(file.bytes) : file.bytes, file.sealed ? 'application/octet-stream' : file.contentType);
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
export async function discardFiles(store: FileStore, files: readonly Pick<StoredFile, 'storagePath'>[]): Promise<void> {
  if (files.length) await store.remove(files.map((f) => f.storagePath));
}

/** The plain bytes of a stored file, for a route that has already decided the reader may have them. */
export async function readStoredFile(db: Db, store: FileStore, id: string): Promise<{ bytes: Buffer; contentType: string; sha256: string } | null> {
  const row = await db.selectFrom('files').select(['storage_path', 'content_type', 'sha256']).where('id', '=', id).executeTakeFirst();
  if (!row) return null;
  const stored = await store.get(row.storage_path);
  if (!stored) return null;
  // Sealed files open transparently; the recorded SHA-256 is always of the plain bytes.
  return { bytes: openBytes(stored), contentType: row.content_type, sha256: row.sha256 };
}

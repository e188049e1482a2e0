import type { Request, Response } from 'express';
import multer from 'multer';
import { invalid } from './errors.ts';

/**
 * Reads one uploaded file into memory, inside the handler, so the permission check has already
 * run before a byte of the upload is buffered. A file over the limit rejects with multer's own
 * LIMIT_FILE_SIZE error, which the error handler answers with 413; every other upload problem
 * is a 400 naming the field.
 */
export async function receiveFile(req: Request, res: Response, opts: { field: string; maxBytes: number }): Promise<Express.Multer.File | undefined> {
  const upload = multer({
    storage: multer.memoryStorage(),
    limits: { fileSize: opts.maxBytes, files: 1, fields: 10, fieldSize: 10_000, parts: 12 },
  }).single(opts.field);
  try {
    await new Promise<void>((resolve, reject) => upload(req, res, (err: unknown) => (err ? reject(err) : resolve())));
  } catch (err) {
    if (err instanceof multer.MulterError) {
      if (err.code === 'LIMIT_FILE_SIZE') throw err;
      if (err.code === 'LIMIT_UNEXPECTED_FILE' || err.code === 'LIMIT_FILE_COUNT') {
        throw invalid({ [opts.field]: [`Send exactly one file, in the form field "${opts.field}".`] });
      }
      throw invalid({ [opts.field]: ['The upload has too many parts or fields.'] });
    }
    // busboy: a body cut off or not multipart after all.
    throw invalid({ [opts.field]: ['The upload was cut off or is not a valid form upload. Try again.'] });
  }
  return req.file;
}

import path from 'node:path';
import type { Request, Response } from 'express';
import { SDS_MAX_BYTES, SafetySheetFieldsSchema, type ProductDetail } from '#shared/schemas/catalogue.ts';
import { fieldErrorsFromIssues } from '#shared/errors.ts';
import { hasControlChars } from '#shared/schemas/common.ts';
import type { Actor } from '#shared/policy.ts';
import type { AppContext } from '../../context.ts';
import { discardFiles, readStoredFile, storeFile, type StoredFile } from '../../files/store.ts';
import { writeAudit } from '../../http/audit.ts';
import { conflict, invalid, notFound } from '../../http/errors.ts';
import { receiveFile } from '../../http/upload.ts';
import { findProduct, lockProduct, touchProductAtVersion } from './repo.ts';
import { productDetail } from './service.ts';

export const NOT_A_PDF = 'This is not a PDF. Upload the safety data sheet as the PDF the maker supplies.';

/**
 * A PDF by its content, whatever its name or declared type says: it opens with the `%PDF-1.x` (or 2.x)
 * header and carries an end-of-file marker near its end, as every complete PDF file does.
 */
export function looksLikePdf(bytes: Buffer): boolean {
  if (!/^%PDF-[12]\.\d/.test(bytes.subarray(0, 8).toString('latin1'))) return false;
  return bytes.subarray(Math.max(0, bytes.length - 2048)).toString('latin1').includes('%%EOF');
}

/** The name shown and offered on download: the uploaded file's own base name, tidied, never used for storage. */
export function sheetFileName(original: string | undefined): string {
  const base = path.basename((original ?? '').replace(/\\/g, '/')).trim();
  const clean = hasControlChars(base) ? '' : base.replace(/["<>|\t\n\r]/g, '').slice(0, 120);
  if (!clean || clean === '.pdf') return 'safety-data-sheet.pdf';
  return /\.pdf$/i.test(clean) ? clean : `${clean}.pdf`;
}

/**
 * Stores a product's safety data sheet (multipart field "sds", text field "version"). The permission
 * was checked before this runs, so no byte is read for someone who may not upload. The previous sheet's
 * file stays on record.
 */
export async function uploadSafetySheet(ctx: AppContext, actor: Actor, req: Request, res: Response, id: string): Promise<ProductDetail> {
  if (!(await findProduct(ctx.db, id))) throw notFound('That product');
  const file = await receiveFile(req, res, { field: 'sds', maxBytes: SDS_MAX_BYTES });
  if (!file) throw invalid({ sds: ['Choose the PDF to upload.'] });
  // Input parsed here: multipart text fields arrive only with the upload.
  const fields = SafetySheetFieldsSchema.safeParse(req.body ?? {});
  if (!fields.success) throw invalid(fieldErrorsFromIssues(fields.error.issues));
  if (!looksLikePdf(file.buffer)) throw invalid({ sds: [NOT_A_PDF] });
  const fileName = sheetFileName(file.originalname);
  const written: StoredFile[] = [];
  try {
    await ctx.db.transaction().execute(async (trx) => {
      const current = await lockProduct(trx, id);
      if (!current) throw notFound('That product');
      if (current.version !== fields.data.version) {
        throw conflict('Someone else changed this product since you opened it. Reload to see their change.', { currentVersion: current.version });
      }
      const stored = await storeFile(trx, ctx.files, { purpose: 'safety_sheet', contentType: 'application/pdf', ext: 'pdf', bytes: file.buffer, createdBy: actor.userId });
      written.push(stored);
      await touchProductAtVersion(trx, id, current.version, { sds_file_id: stored.id, sds_file_name: fileName, sds_uploaded_at: new Date(), sds_uploaded_by: actor.userId });
      await writeAudit(trx, { actorUserId: actor.userId, action: 'product.sds_upload', entityType: 'product', entityId: id, req, details: { fileId: stored.id, previousFileId: current.sdsFileId, byteSize: stored.byteSize, sha256: stored.sha256 } });
    });
  } catch (err) {
    await discardFiles(ctx.files, written);
    throw err;
  }
  return productDetail(ctx.db, id);
}

/** Sends the sheet as a download, for anyone who may read the catalogue. */
export async function sendSafetySheet(ctx: AppContext, id: string, res: Response): Promise<void> {
  const p = await findProduct(ctx.db, id);
  if (!p) throw notFound('That product');
  if (!p.sdsFileId) throw notFound('A safety data sheet for this product');
  const file = await readStoredFile(ctx.db, ctx.files, p.sdsFileId);
  if (!file) throw notFound('A safety data sheet for this product');
  res.set('Cache-Control', 'private, no-cache');
  res.set('ETag', `"${file.sha256}"`);
  res.attachment(p.sdsFileName ?? 'safety-data-sheet.pdf');
  res.type('application/pdf').send(file.bytes);
}

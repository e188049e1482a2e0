import type { Db } from '../../db/index.ts';

export interface ReadingPhotoFile {
  photoId: string;
  testId: string;
  readingId: string;
  fileId: string;
}

/** Every reading photo of a performer's tests with its stored (sealed) file, for their records export. */
export async function listReadingPhotosOfPerformer(db: Db, performerId: string): Promise<ReadingPhotoFile[]> {
  const rows = await db
    .selectFrom('patch_test_photos as ph')
    .innerJoin('patch_test_readings as r', 'r.id', 'ph.reading_id')
    .innerJoin('patch_test_products as tp', 'tp.id', 'r.test_product_id')
    .innerJoin('patch_tests as t', 't.booking_id', 'tp.test_id')
    .select(['ph.id', 'tp.test_id', 'ph.reading_id', 'ph.file_id'])
    .where('t.performer_id', '=', performerId)
    .orderBy('ph.created_at')
    .orderBy('ph.id')
    .execute();
  return rows.map((r) => ({ photoId: r.id, testId: r.test_id, readingId: r.reading_id, fileId: r.file_id }));
}

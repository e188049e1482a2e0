// What other features may use of patch tests; everything else here is the feature's own.
// A performer's clearance per product (the artist's check reads it), from a fixed number of queries.
export { performerClearances, type PerformerClearancesQuery } from './clearance-loader.ts';
// The homes' patch-test lists, and what a reminder job reads: tests under reading with their protocols.
export { headPatchTestTasks, leadReadingTasks, readingLists, testsUnderReading, type TestUnderReadingRow } from './home-tasks.ts';
// A performer's tests and clearances, and one test with its readings (their records export reads them).
export { performerPatchTests } from './performer-service.ts';
export { detailFor as patchTestDetail } from './service.ts';
// The performer's records export: their reading photos, and the printable record of their tests.
export { listReadingPhotosOfPerformer } from './records.ts';
export { renderSummaryPdf as renderPatchTestRecordPdf } from './summary-pdf.ts';

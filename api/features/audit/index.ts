// What other features may use of the audit log.
export { listAuditAbout, listHealthReadsOf } from './repo.ts';

// What other features may use of the audit log.
export { listHealthReadsOf } from './repo.ts';

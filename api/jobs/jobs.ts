import { overdueRemindersJob } from '../features/archive/overdue-job.ts';
import { readingRemindersJob } from '../features/patch-tests/reminder-job.ts';
import type { JobDefinition } from './define.ts';

/** Every background job the API process runs; a new one is one line here. */
export const allJobs: readonly JobDefinition[] = [overdueRemindersJob, readingRemindersJob];

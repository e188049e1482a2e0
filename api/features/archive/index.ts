// What other features may use of the life-cast archive.
export { archivistTasks } from './home-tasks.ts';
export { listCastsOfPerformer } from './repo-casts.ts';

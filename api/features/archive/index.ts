// What other features may use of the life-cast archive.
export { archivistTasks } from './home-tasks.ts';
export { listCastsOfPerformer } from './repo-casts.ts';
// Molds for appliance builds: a build names the mold its pieces were poured from.
export { findCast, findCastsByIds, listHeldMoldsFor, type CastRecord } from './repo-casts.ts';
// A performer's casts with their movements, for the performer's records export.
export { castRecordsOfPerformer } from './performer-records.ts';

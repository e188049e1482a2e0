// What other features may use of the application log: counts for the homes.
export { countOpenIncidents } from './incident-repo.ts';
export { listApplicationProducts, listApplicationRows } from './repo.ts';

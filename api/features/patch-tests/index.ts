// What other features may use of patch tests; everything else here is the feature's own.
// A performer's clearance per product (the artist's check reads it), from a fixed number of queries.
export { performerClearances, type PerformerClearancesQuery } from './clearance-loader.ts';

// What other features may use of performers on the client.
export { performersQueryOptions } from './api.ts';

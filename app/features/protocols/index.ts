// What other features may use of the test protocols on the client: the list to book a test on.
export { protocolsQueryOptions } from './api.ts';

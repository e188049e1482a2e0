// What other features may use of consent forms on the client.
export { templatesQueryOptions } from './api.ts';

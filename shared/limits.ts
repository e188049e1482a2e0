/** Upload limits, shared so the client can refuse an oversized file before sending it. */
export const PORTRAIT_MAX_BYTES = 10 * 1024 * 1024;
export const IMPORT_MAX_BYTES = 2 * 1024 * 1024;
export const IMPORT_MAX_ROWS = 2000;
export const VERIFY_MAX_BYTES = 20 * 1024 * 1024;

/** Upload limits, shared so the client can refuse an oversized file before sending it. */
export const PORTRAIT_MAX_BYTES = 10 * 1024 * 1024;
export const IMPORT_MAX_BYTES = 2 * 1024 * 1024;
export const IMPORT_MAX_ROWS = 2000;
export const VERIFY_MAX_BYTES = 20 * 1024 * 1024;
/** Cast and condition photos: the same ceiling as portraits, one file per request. */
export const CAST_PHOTO_MAX_BYTES = 10 * 1024 * 1024;
/** Photos of more pixels are refused before decoding (a decompression bomb's opening move). */
export const PHOTO_MAX_PIXELS = 100_000_000;

/** Upload limits (pure: the upload page checks them before sending). */

/** Largest original accepted: 200 MiB. */
export const MAX_UPLOAD_BYTES = 200 * 1024 * 1024;

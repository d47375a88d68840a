/**
 * Limits of the curve file reader, in a module of their own so the reader
 * options schema (and the browser) can share them without the reader itself.
 */

export const MAX_FILE_BYTES = 5 * 1024 * 1024;
export const MAX_ROWS = 200_000;
/** Data rows plus a generous allowance of comments and blank lines; bounds the memory of the line index. */
export const MAX_LINES = 1_000_000;
/** A curve needs two columns; 64 leaves room for any lab export while keeping the cost of a row bounded. */
export const MAX_COLUMNS = 64;
/** Longer than any double written out in full (17 significant digits, sign, mark, exponent). */
export const MAX_NUMBER_CHARS = 64;

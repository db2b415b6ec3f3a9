/**
 * Size caps for data files. A log is read into memory as a whole, so a file far larger than any
 * bench log is refused with a clear message instead of exhausting memory silently.
 *
 * 512 MiB and 5 million data rows: a 10 kHz log of an hour with a dozen columns fits in both;
 * beyond that, decimate or cut the log into experiments (common practice, no source).
 */
export const MAX_DATA_FILE_BYTES = 512 * 1024 * 1024;
export const MAX_DATA_ROWS = 5_000_000;

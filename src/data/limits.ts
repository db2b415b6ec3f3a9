/**
 * Size caps for data files. A log is read into memory as a whole, so a file far larger than any
 * bench log is refused with a clear message instead of exhausting memory silently.
 *
 * 500 MiB and 5 million data rows: a 10 kHz log of an hour with a dozen columns fits in both;
 * beyond that, decimate or cut the log into experiments (common practice, no source). The log is
 * decoded into one string, and V8's strings end at 2^29 - 24 characters (about 512 MiB): the byte
 * cap stays below that.
 */
export const MAX_DATA_FILE_BYTES = 500 * 1024 * 1024;
export const MAX_DATA_ROWS = 5_000_000;

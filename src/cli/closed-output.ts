/**
 * A reader that closes the pipe early (`rigcal simulate MODEL | head -1`) is a normal way to use a
 * command-line tool, not an error. Node ignores SIGPIPE, so the write fails with EPIPE and the
 * unhandled stream error would end the process with a stack trace. Instead the process ends at once,
 * quietly, with the shell's code for a writer killed by SIGPIPE (128 + 13), as other Unix tools do.
 */
import type { Writable } from 'node:stream';

/** Exit code when standard output or error is closed by its reader: 128 + SIGPIPE (13). */
export const CLOSED_OUTPUT_EXIT_CODE = 141;

/** Codes of a write to a stream whose reader has gone (the first EPIPE destroys the stream). */
const READER_GONE = new Set(['EPIPE', 'ERR_STREAM_DESTROYED']);

/** Ends the process quietly when `stream`'s reader goes away; any other stream error stays loud. */
export function endQuietlyWhenReaderCloses(stream: Writable, exit: (code: number) => never = process.exit): void {
  stream.on('error', (err: NodeJS.ErrnoException) => {
    if (err.code && READER_GONE.has(err.code)) exit(CLOSED_OUTPUT_EXIT_CODE);
    throw err;
  });
}

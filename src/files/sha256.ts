/** The fingerprint rigcal records for every file it reads (model, logs, estimates): SHA-256 of the bytes, lower-case hex. */
import { createHash } from 'node:crypto';
import { closeSync, openSync, readSync } from 'node:fs';

export function sha256Hex(bytes: Uint8Array | string): string {
  return createHash('sha256').update(bytes).digest('hex');
}

/**
 * SHA-256 of a file's bytes, read in 1 MiB pieces: a long log is hashed without holding it in
 * memory. Answers the system's error code (e.g. ENOENT) as a value when the file cannot be read.
 */
export function sha256OfFile(path: string): { ok: true; sha256: string } | { ok: false; code: string } {
  let fd: number | undefined;
  try {
    fd = openSync(path, 'r');
    const hash = createHash('sha256');
    const buffer = Buffer.alloc(1 << 20);
    for (let n = readSync(fd, buffer); n > 0; n = readSync(fd, buffer)) hash.update(buffer.subarray(0, n));
    return { ok: true, sha256: hash.digest('hex') };
  } catch (err) {
    return { ok: false, code: (err as NodeJS.ErrnoException).code ?? (err as Error).message };
  } finally {
    if (fd !== undefined) closeSync(fd);
  }
}

/** The fingerprint rigcal records for every file it reads (model, logs, estimates): SHA-256 of the bytes, lower-case hex. */
import { createHash } from 'node:crypto';

export function sha256Hex(bytes: Uint8Array | string): string {
  return createHash('sha256').update(bytes).digest('hex');
}

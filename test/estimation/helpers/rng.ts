/**
 * Seeded random numbers for synthetic test data: mulberry32 (a small public-domain 32-bit generator
 * by Tommy Ettinger) and Box-Muller normals. Reproducible across runs and machines.
 */

import { mulberry32 } from '../../../src/util/random.js';

export { mulberry32 };

export function normalGenerator(seed: number): () => number {
  const u = mulberry32(seed);
  let spare: number | undefined;
  return () => {
    if (spare !== undefined) {
      const s = spare;
      spare = undefined;
      return s;
    }
    let u1 = u();
    while (u1 <= 0) u1 = u();
    const u2 = u();
    const r = Math.sqrt(-2 * Math.log(u1));
    spare = r * Math.sin(2 * Math.PI * u2);
    return r * Math.cos(2 * Math.PI * u2);
  };
}

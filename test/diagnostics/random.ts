import { mulberry32 } from '../../src/util/random.js';

/** Seeded normal noise for tests (mulberry32 + Box-Muller): reproducible, no dependency. */
export function normalNoise(seed: number): () => number {
  const uniform = mulberry32(seed);
  return () => {
    const u = Math.max(uniform(), 1e-300);
    return Math.sqrt(-2 * Math.log(u)) * Math.cos(2 * Math.PI * uniform());
  };
}

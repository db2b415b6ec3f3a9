/**
 * The project's one seeded pseudo-random generator: multistart spreads (reproducible from `--seed`),
 * demo data and synthetic test data all draw from it.
 * mulberry32 (Tommy Ettinger, public domain): 32-bit state, full period 2^32, good enough to spread
 * a few dozen start points; not for cryptography or long simulations.
 */
export function mulberry32(seed: number): () => number {
  let a = seed >>> 0;
  return () => {
    a = (a + 0x6d2b79f5) >>> 0;
    let t = a;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}

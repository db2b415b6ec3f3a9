/**
 * The project's one seeded pseudo-random generator: multistart spreads (reproducible from `--seed`),
 * demo data and synthetic test data all draw from it.
 * mulberry32 (Tommy Ettinger, public domain): 32-bit state, full period 2^32, good enough to spread
 * a few dozen start points and to make measurement noise; not for cryptography or long simulations.
 * Only 32-bit integer arithmetic, so the sequence is the same on every platform.
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

export interface SeededRandom {
  /** Uniform on [0, 1). */
  uniform(): number;
  /** Standard normal. */
  normal(): number;
}

/**
 * Uniform and standard normal deviates from one seed. Normals by the Box-Muller transform (Box and
 * Muller 1958), both deviates of each pair used: cos first, then the spare sin.
 */
export function seededRandom(seed: number): SeededRandom {
  const uniform = mulberry32(seed);
  let spare: number | undefined;
  const normal = () => {
    if (spare !== undefined) {
      const s = spare;
      spare = undefined;
      return s;
    }
    let u = 0;
    while (u === 0) u = uniform();
    const v = uniform();
    const r = Math.sqrt(-2 * Math.log(u));
    spare = r * Math.sin(2 * Math.PI * v);
    return r * Math.cos(2 * Math.PI * v);
  };
  return { uniform, normal };
}

/** A seeded standard normal generator (the `normal` of seededRandom). */
export function normalDeviates(seed: number): () => number {
  return seededRandom(seed).normal;
}

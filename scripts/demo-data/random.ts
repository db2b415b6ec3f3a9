/**
 * Seeded random numbers for the demo data: mulberry32 (a small, widely used 32-bit generator) for
 * uniforms and the Box-Muller transform for Gaussian noise. Good enough for measurement noise in
 * demos; reproducible across platforms because it uses only 32-bit integer arithmetic.
 */
import { mulberry32 } from '../../src/util/random.js';

export interface Rng {
  uniform(): number;
  normal(): number;
}

export function seededRng(seed: number): Rng {
  let spare: number | undefined;
  const uniform = mulberry32(seed);
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

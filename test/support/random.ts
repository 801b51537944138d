/** Seeded random numbers for tests: mulberry32 (a common public-domain generator, shared with the fuzz run) and Box-Muller normals (common practice). */
import { prng } from '../../fuzz/prng.mjs';

export const rng: (seed: number) => () => number = prng;

export function gauss(r: () => number): number {
  return Math.sqrt(-2 * Math.log(1 - r())) * Math.cos(2 * Math.PI * r());
}

/**
 * Seeded pseudo-random numbers for the simulator: a seed reproduces every simulated value bit for bit.
 *
 * Generator: xoshiro128** 1.1 (Blackman & Vigna, "Scrambled linear pseudorandom number generators",
 * ACM TOMS 47(4), 2021), 32-bit state words, seeded through splitmix32 (a 32-bit variant of Steele, Lea &
 * Flood's SplitMix, OOPSLA 2014; the mixing constants are those of the "lowbias32" integer hash, from
 * memory). Named sub-streams come from hashing a label with FNV-1a 32 (Fowler-Noll-Vo, common practice),
 * so each satellite, receiver and error process draws from its own stream whatever the order of use.
 * Normal deviates: Marsaglia & Bray polar method (SIAM Review 6(3), 1964).
 */

/** FNV-1a 32-bit hash of a string (offset basis 2166136261, prime 16777619). */
export function fnv1a32(text: string): number {
  let h = 0x811c9dc5;
  for (let i = 0; i < text.length; i++) {
    h ^= text.charCodeAt(i);
    h = Math.imul(h, 0x01000193) >>> 0;
  }
  return h >>> 0;
}

/** One splitmix32 step: returns [next state, output]. */
function splitmix32(state: number): [number, number] {
  const s = (state + 0x9e3779b9) >>> 0;
  let z = s;
  z = Math.imul(z ^ (z >>> 16), 0x21f0aaad) >>> 0;
  z = Math.imul(z ^ (z >>> 15), 0x735a2d97) >>> 0;
  z = (z ^ (z >>> 15)) >>> 0;
  return [s, z];
}

function rotl(x: number, k: number): number {
  return ((x << k) | (x >>> (32 - k))) >>> 0;
}

/** A seeded xoshiro128** stream. */
export class Rng {
  private s0: number;
  private s1: number;
  private s2: number;
  private s3: number;
  private spareNormal: number | null = null;

  /** `seed` is any integer (its low 32 bits and the high part are both used) or string; labels select a sub-stream. */
  constructor(seed: number | string, ...labels: readonly (string | number)[]) {
    let st = typeof seed === 'number' ? (fnv1a32(String(Math.trunc(seed))) ^ (seed >>> 0)) >>> 0 : fnv1a32(seed);
    if (labels.length > 0) st = (st ^ fnv1a32(labels.join('/'))) >>> 0;
    let o: number;
    [st, o] = splitmix32(st); this.s0 = o;
    [st, o] = splitmix32(st); this.s1 = o;
    [st, o] = splitmix32(st); this.s2 = o;
    [st, o] = splitmix32(st); this.s3 = o;
    if ((this.s0 | this.s1 | this.s2 | this.s3) === 0) this.s0 = 1; // the all-zero state is forbidden
  }

  /** Next 32-bit unsigned integer (xoshiro128** 1.1: result = rotl(s1 * 5, 7) * 9). */
  nextU32(): number {
    const result = Math.imul(rotl(Math.imul(this.s1, 5) >>> 0, 7), 9) >>> 0;
    const t = (this.s1 << 9) >>> 0;
    this.s2 = (this.s2 ^ this.s0) >>> 0;
    this.s3 = (this.s3 ^ this.s1) >>> 0;
    this.s1 = (this.s1 ^ this.s2) >>> 0;
    this.s0 = (this.s0 ^ this.s3) >>> 0;
    this.s2 = (this.s2 ^ t) >>> 0;
    this.s3 = rotl(this.s3, 11);
    return result;
  }

  /** Uniform in [0, 1) with 53 random bits (two draws; common practice). */
  uniform(): number {
    const hi = this.nextU32() >>> 5; // 27 bits
    const lo = this.nextU32() >>> 6; // 26 bits
    return (hi * 67108864 + lo) / 9007199254740992;
  }

  /** Uniform in [lo, hi). */
  between(lo: number, hi: number): number {
    return lo + (hi - lo) * this.uniform();
  }

  /** Integer uniform in [lo, hi] (inclusive). */
  int(lo: number, hi: number): number {
    return lo + Math.floor(this.uniform() * (hi - lo + 1));
  }

  /** -1 or +1 with equal probability. */
  sign(): number {
    return this.uniform() < 0.5 ? -1 : 1;
  }

  /** Standard normal deviate: Marsaglia polar method (pairs; the second is kept for the next call). */
  normal(): number {
    if (this.spareNormal !== null) {
      const v = this.spareNormal;
      this.spareNormal = null;
      return v;
    }
    for (;;) {
      const u = 2 * this.uniform() - 1;
      const v = 2 * this.uniform() - 1;
      const s = u * u + v * v;
      if (s >= 1 || s === 0) continue;
      const m = Math.sqrt((-2 * Math.log(s)) / s);
      this.spareNormal = v * m;
      return u * m;
    }
  }

  /** Fisher-Yates shuffle of a copy (Knuth TAOCP vol. 2, 3.4.2 algorithm P). */
  shuffled<T>(items: readonly T[]): T[] {
    const a = items.slice();
    for (let i = a.length - 1; i > 0; i--) {
      const j = Math.floor(this.uniform() * (i + 1));
      const t = a[i]!;
      a[i] = a[j]!;
      a[j] = t;
    }
    return a;
  }
}

/** An Rng with an explicit xoshiro128** state (for checking the generator against published output). */
export function rngFromState(s0: number, s1: number, s2: number, s3: number): Rng {
  const r = new Rng(0);
  const w = r as unknown as { s0: number; s1: number; s2: number; s3: number };
  w.s0 = s0 >>> 0; w.s1 = s1 >>> 0; w.s2 = s2 >>> 0; w.s3 = s3 >>> 0;
  return r;
}

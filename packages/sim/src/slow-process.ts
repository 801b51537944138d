/**
 * Slowly varying random processes as a sum of sinusoids with random periods and phases (a "random
 * phase" spectral representation: Rice, "Mathematical analysis of random noise", Bell Syst. Tech. J. 23,
 * 1944, section 2.8). Evaluated in closed form at any instant, so reference and rover see the same value
 * at the same time and an epoch stream can start anywhere with bounded memory.
 */
import { Rng } from './rng.js';

export interface SlowProcess {
  /** Value at t (same unit as sigma). */
  at(tS: number): number;
  /** Time derivative at t (unit per second). */
  rateAt(tS: number): number;
}

export const ZERO_PROCESS: SlowProcess = { at: () => 0, rateAt: () => 0 };

/** The sum of two processes. */
export function sumOfProcesses(a: SlowProcess, b: SlowProcess): SlowProcess {
  return { at: (t) => a.at(t) + b.at(t), rateAt: (t) => a.rateAt(t) + b.rateAt(t) };
}

/**
 * K sinusoids, equal amplitude sigma*sqrt(2/K) so the RMS over a long span is sigma (mean square of a
 * sinusoid of amplitude a is a^2/2), periods uniform in [minPeriodS, maxPeriodS].
 */
export function sumOfSinusoids(rng: Rng, sigma: number, minPeriodS: number, maxPeriodS: number, k = 3): SlowProcess {
  if (sigma === 0) return ZERO_PROCESS;
  const amp = sigma * Math.sqrt(2 / k);
  const omega = new Float64Array(k);
  const phase = new Float64Array(k);
  for (let i = 0; i < k; i++) {
    omega[i] = (2 * Math.PI) / rng.between(minPeriodS, maxPeriodS);
    phase[i] = rng.between(0, 2 * Math.PI);
  }
  return {
    at(tS: number): number {
      let s = 0;
      for (let i = 0; i < k; i++) s += Math.sin(omega[i]! * tS + phase[i]!);
      return amp * s;
    },
    rateAt(tS: number): number {
      let s = 0;
      for (let i = 0; i < k; i++) s += omega[i]! * Math.cos(omega[i]! * tS + phase[i]!);
      return amp * s;
    },
  };
}

/**
 * Planned random episodes of a receiver (data gaps, satellite dropouts, faulty-satellite steps), drawn
 * once from the seed as a Poisson process (exponential waiting times with the given rate: common
 * practice), so an epoch stream can be generated lazily and repeated identically.
 */
import { Rng } from './rng.js';

export interface Window {
  readonly startGpsS: number;
  readonly endGpsS: number;
  /** A uniform number in [0, 1) drawn with the window: picks the satellite among those in view at its start. */
  readonly pick: number;
  /** Magnitude drawn with the window (fault step in metres, signed), 0 when not used. */
  readonly value: number;
}

/**
 * Windows of a Poisson process of `perHour` events in [fromGpsS, toGpsS), each lasting a uniform
 * [minS, maxS] seconds; `value` is drawn uniform in [minValue, maxValue] with a random sign.
 */
export function poissonWindows(
  rng: Rng, perHour: number, fromGpsS: number, toGpsS: number, minS: number, maxS: number, minValue = 0, maxValue = 0,
): Window[] {
  const out: Window[] = [];
  if (!(perHour > 0) || !(toGpsS > fromGpsS)) return out;
  const meanGapS = 3600 / perHour;
  let t = fromGpsS;
  for (;;) {
    t += -Math.log(1 - rng.uniform()) * meanGapS;
    if (t >= toGpsS) break;
    const len = rng.between(minS, maxS);
    const pick = rng.uniform();
    const value = maxValue > 0 ? rng.sign() * rng.between(minValue, maxValue) : 0;
    out.push({ startGpsS: t, endGpsS: Math.min(toGpsS, t + len), pick, value });
  }
  return out;
}

/** Index of the window containing t, or -1 (windows sorted and non-overlapping or overlapping: first match). */
export function windowAt(windows: readonly Window[], tGpsS: number): number {
  for (let i = 0; i < windows.length; i++) {
    const w = windows[i]!;
    if (tGpsS < w.startGpsS) return -1;
    if (tGpsS < w.endGpsS) return i;
  }
  return -1;
}

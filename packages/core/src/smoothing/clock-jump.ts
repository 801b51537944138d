/**
 * Receiver clock millisecond jumps. Many receivers keep their clock within +-1 ms of GPS time by stepping
 * it a whole millisecond; every pseudorange then jumps by c * 1 ms = 299792.458 m at the same epoch,
 * while the carrier phase may or may not jump with it (receiver dependent: common practice, from memory of
 * receiver documentation; no single source). A jump shows up as the same whole number of milliseconds in the
 * epoch-to-epoch change of code-minus-carrier on (nearly) all satellites; a cycle slip is satellite-specific.
 */

/** c * 1 ms (m): speed of light (SI) times 1e-3 s. */
export const MILLISECOND_RANGE_M = 299_792.458;

export interface ClockJump {
  /** Common change of code-minus-carrier (m): a whole number of milliseconds times c. Positive: code jumped up relative to the carrier. */
  readonly jumpM: number;
  readonly milliseconds: number;
  /** How many satellites agree with it. */
  readonly satellites: number;
}

export interface ClockJumpOptions {
  /** A satellite agrees when its change is within this of k * c * 1 ms; default 10 m (code noise + 1 epoch of ionosphere change are far below: common practice). */
  readonly toleranceM?: number;
  /** Fraction of the satellites that must agree; default 0.5 (a majority; the others are treated as slips). */
  readonly minFraction?: number;
}

/**
 * Detect a common millisecond jump in the epoch-to-epoch changes of code-minus-carrier (m) of the
 * satellites tracked continuously across the two epochs. NaN entries are ignored. Returns null when none.
 */
export function detectMillisecondClockJump(codeMinusCarrierChangesM: ArrayLike<number>, opts: ClockJumpOptions = {}): ClockJump | null {
  const tol = opts.toleranceM ?? 10;
  const minFraction = opts.minFraction ?? 0.5;
  // The median is one of the changes: when none rounds to a whole millisecond there is no jump (the usual epoch).
  let anyMillisecond = false;
  for (let i = 0; i < codeMinusCarrierChangesM.length; i++) {
    const v = codeMinusCarrierChangesM[i];
    if (Number.isFinite(v) && Math.round(v / MILLISECOND_RANGE_M) !== 0) { anyMillisecond = true; break; }
  }
  if (!anyMillisecond) return null;
  const values: number[] = [];
  for (let i = 0; i < codeMinusCarrierChangesM.length; i++) {
    const v = codeMinusCarrierChangesM[i];
    if (Number.isFinite(v)) values.push(v);
  }
  if (values.length === 0) return null;
  values.sort((a, b) => a - b);
  const median = values[values.length >> 1];
  const ms = Math.round(median / MILLISECOND_RANGE_M);
  if (ms === 0) return null;
  const jumpM = ms * MILLISECOND_RANGE_M;
  let agree = 0;
  for (const v of values) if (Math.abs(v - jumpM) <= tol) agree++;
  if (agree < Math.max(1, Math.ceil(minFraction * values.length))) return null;
  return { jumpM, milliseconds: ms, satellites: agree };
}

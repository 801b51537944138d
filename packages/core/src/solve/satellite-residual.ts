/** One satellite's part in an epoch solution (standalone or differential). */
import type { SatId } from '../gnss/index.js';

export interface SatelliteResidual {
  readonly sat: SatId;
  /** Observation code used (e.g. 'C1C'); for a difference, the rover's code (the reference used the same unless `bias` says otherwise). */
  readonly signal: string;
  readonly elevationDeg: number;
  readonly azimuthDeg: number;
  /** Post-fit residual (m); NaN when the satellite was not in the final solution. */
  readonly residualM: number;
  /** Weight (1/m^2) used; 0 when not used. */
  readonly weight: number;
  /** Normalised residual (w-test statistic); NaN when not computed. */
  readonly wTest: number;
  readonly used: boolean;
  /** Why it was not used, in words ('below elevation mask', 'no ephemeris', 'not seen by reference', 'rejected by data snooping (w = 5.2)'...). Empty when used. */
  readonly reason: string;
}


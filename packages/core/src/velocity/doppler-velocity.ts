/**
 * Receiver velocity and clock drift from Doppler measurements by weighted least squares.
 *
 * Observation (RINEX 3.05 section 5.7 / RINEX 2.11 section 4: Doppler is positive for approaching
 * satellites), so the observed pseudorange rate is  rhoDot_obs = -lambda D  (m/s).
 * Model (Misra & Enge, "Global Positioning System", 2nd ed. 2011, section 6.2, eq. 6.20-6.22;
 * Kaplan & Hegarty, "Understanding GPS/GNSS", 3rd ed. 2017, section 11.2.2 on velocity estimation):
 *
 *   rhoDot = e . (v_sat - v_rx) + c (dtDot_rx - dtDot_sat)
 *
 * with e the unit vector receiver -> satellite and v_sat the broadcast-orbit velocity at transmission in
 * the ECEF frame of the receive time (orbit/transmit.ts). Linear in the unknowns: design row
 * [-e_x, -e_y, -e_z, 1 (this satellite's system)], misclosure  y = -lambda D - e . v_sat + c dtDot_sat.
 * One receiver clock drift (c dtDot_rx, m/s) per constellation: the receiver's inter-system biases drift
 * too (common practice; costs one satellite per extra system).
 *
 * Weights: sigma^2 = a^2 + b^2 / sin^2(elevation) with a = b = 0.05 m/s (common practice form as for
 * code, see check-values.md "Weighting"; the size of the range-rate noise, a few cm/s for a low-cost
 * receiver, is from memory). Only relative weights change the estimate; the reported sigma uses the
 * a-posteriori variance factor.
 * Outliers: the satellite with the largest normalised residual |v_i| / (sigma0 sqrt(qvv_i)) above 4 is
 * removed and the solution repeated, at most 3 times, while redundancy remains (data snooping in the
 * spirit of Baarda 1968, with the a-posteriori factor: our simplification).
 */
import type { EcefM, EnuM, GnssSystem, SatId } from '../gnss/index.js';
import { satSystem } from '../gnss/index.js';
import type { ObsEpoch, SatObservations } from '../gnss/index.js';
import { carrierWavelengthM } from '../gnss/index.js';
import { EphemerisStore, satelliteAtTransmission, SPEED_OF_LIGHT_MS, type SatelliteAtTransmission } from '../orbit/index.js';
import { azimuthElevation, ecefDeltaToEnu, ecefToGeodetic } from '../geodesy/index.js';
import { solveWeightedLeastSquaresSmall } from '../solve/index.js';
import { primaryCodeSlots, pseudorangeAt } from '../observables/index.js';
import { PRIMARY_BAND, clockSignal } from '../observables/index.js';

export interface DopplerVelocityOptions {
  /** Satellites already computed for this epoch (position, velocity, clock at transmission), reused when present. */
  readonly satellites?: { get(sat: SatId): SatelliteAtTransmission | undefined };
  readonly systems: readonly GnssSystem[];
  readonly elevationMaskRad: number;
  /** GLONASS slot -> frequency channel k (for the FDMA wavelength). */
  readonly glonassChannels: ReadonlyMap<number, number>;
}

export interface DopplerVelocity {
  /** Receiver velocity, east/north/up at the given position (m/s). */
  readonly velocityEnuMS: EnuM;
  readonly velocityEcefMS: EcefM;
  /** Horizontal speed over ground sqrt(vE^2 + vN^2) (m/s). */
  readonly speedMS: number;
  /** Formal 1-sigma of the velocity components (a-posteriori variance factor applied; NaN without redundancy). */
  readonly sigmaEnuMS: EnuM;
  /** A-posteriori standard deviation of unit weight (dimensionless; NaN without redundancy). */
  readonly sigma0: number;
  /** Receiver clock drift times c (m/s) per constellation used. */
  readonly clockDriftMS: Readonly<Partial<Record<GnssSystem, number>>>;
  readonly satellitesUsed: number;
  /** Satellites removed as outliers. */
  readonly rejected: readonly SatId[];
}

const A_MS = 0.05;
const B_MS = 0.05;
const MIN_ELEVATION_FOR_WEIGHT_RAD = (5 * Math.PI) / 180;
const OUTLIER_LIMIT = 4;
const MAX_REJECTIONS = 3;

interface Row {
  readonly sat: SatId;
  readonly system: GnssSystem;
  readonly e: EcefM;
  readonly yMS: number;
  readonly varianceM2S2: number;
}

/** Where a code list (shared by a file's satellites of one system) holds the Doppler of the primary band. */
interface DopplerSlots {
  /** Per primary pseudorange slot (primaryCodeSlots order): the index of its Doppler, -1 when none. */
  readonly paired: readonly number[];
  /** Every Doppler of the primary band, in the list's order. */
  readonly anyOnBand: readonly number[];
}

const dopplerSlotsByList = new WeakMap<readonly string[], Map<GnssSystem, DopplerSlots>>();

function dopplerSlots(system: GnssSystem, codes: readonly string[]): DopplerSlots {
  let bySystem = dopplerSlotsByList.get(codes);
  if (!bySystem) { bySystem = new Map(); dopplerSlotsByList.set(codes, bySystem); }
  let slots = bySystem.get(system);
  if (!slots) {
    const band = PRIMARY_BAND[system];
    slots = {
      paired: primaryCodeSlots(system, codes).map((slot) => codes.indexOf('D' + slot.code.slice(1))),
      anyOnBand: codes.filter((c) => c[0] === 'D' && c[1] === band).map((c) => codes.indexOf(c)),
    };
    bySystem.set(system, slots);
  }
  return slots;
}

/**
 * Index in the code list of the Doppler on the primary band: the one paired with the preferred pseudorange
 * code present, else any with a value; -1 when none.
 */
function primaryDopplerIndex(system: GnssSystem, s: SatObservations): number {
  const slots = dopplerSlots(system, s.codes);
  const codeSlots = primaryCodeSlots(system, s.codes);
  for (let k = 0; k < codeSlots.length; k++) {
    const i = slots.paired[k];
    if (i >= 0 && !Number.isNaN(pseudorangeAt(s, codeSlots[k])) && Number.isFinite(s.values[i])) return i;
  }
  for (const i of slots.anyOnBand) if (Number.isFinite(s.values[i])) return i;
  return -1;
}

function pseudorangeFor(s: SatObservations, dopplerCode: string): number | null {
  const i = s.codes.indexOf('C' + dopplerCode.slice(1));
  const v = i >= 0 ? s.values[i] : NaN;
  return v > 1e6 && v < 1e9 ? v : null;
}

/** The 1-sigma of one ENU axis from the ECEF velocity covariance q (n x n, first 3 x 3 used), its rows rotated by `rot`, scaled by f. */
function enuSigmaMS(rot: readonly EnuM[], q: Float64Array, n: number, f: number, axis: 'e' | 'n' | 'u'): number {
  let s = 0;
  for (let a = 0; a < 3; a++) for (let b = 0; b < 3; b++) s += rot[a]![axis] * q[a * n + b]! * rot[b]![axis];
  return Math.sqrt(Math.max(s, 0) * f);
}

export function dopplerVelocity(epoch: ObsEpoch, positionM: EcefM, store: EphemerisStore, opts: DopplerVelocityOptions): DopplerVelocity | null {
  const g = ecefToGeodetic(positionM);
  const rows: Row[] = [];
  for (const s of epoch.sats) {
    const system = satSystem(s.sat);
    if (!opts.systems.includes(system)) continue;
    const di = primaryDopplerIndex(system, s);
    if (di < 0) continue;
    const dopplerCode = s.codes[di], dopplerHz = s.values[di];
    if (dopplerHz === 0) continue;
    const k = system === 'R' ? opts.glonassChannels.get(Number(s.sat.slice(1))) : undefined;
    const lambdaM = carrierWavelengthM(system, dopplerCode, k);
    if (!Number.isFinite(lambdaM)) continue;
    let at = opts.satellites?.get(s.sat);
    if (at === undefined) {
      const sel = store.select(s.sat, epoch.tagGpsS);
      if (sel.eph === null) continue;
      at = satelliteAtTransmission(sel.eph, epoch.tagGpsS, pseudorangeFor(s, dopplerCode), positionM, clockSignal(system, dopplerCode[1]));
    }
    const ae = azimuthElevation(positionM, at.posM, g.latRad, g.lonRad);
    if (ae.elevationRad < opts.elevationMaskRad) continue;
    const dx = at.posM.x - positionM.x, dy = at.posM.y - positionM.y, dz = at.posM.z - positionM.z;
    const r = Math.sqrt(dx * dx + dy * dy + dz * dz);
    const e = { x: dx / r, y: dy / r, z: dz / r };
    // y = -lambda D - e . v_sat + c dtDot_sat (Misra & Enge 2011, eq. 6.21 rearranged)
    const yMS = -lambdaM * dopplerHz - (e.x * at.velMS.x + e.y * at.velMS.y + e.z * at.velMS.z) + SPEED_OF_LIGHT_MS * at.clock.driftSS;
    if (!Number.isFinite(yMS)) continue;
    const sinEl = Math.sin(Math.max(ae.elevationRad, MIN_ELEVATION_FOR_WEIGHT_RAD));
    rows.push({ sat: s.sat, system, e, yMS, varianceM2S2: A_MS * A_MS + (B_MS * B_MS) / (sinEl * sinEl) });
  }
  const rejected: SatId[] = [];
  let active = rows;
  for (;;) {
    const systems = [...new Set(active.map((r) => r.system))];
    const n = 3 + systems.length;
    const m = active.length;
    if (m < n) return null;
    const design = new Float64Array(m * n);
    const y = new Float64Array(m);
    const variances = new Float64Array(m);
    active.forEach((row, i) => {
      design[i * n] = -row.e.x;
      design[i * n + 1] = -row.e.y;
      design[i * n + 2] = -row.e.z;
      design[i * n + 3 + systems.indexOf(row.system)] = 1;
      y[i] = row.yMS;
      variances[i] = row.varianceM2S2;
    });
    const sol = solveWeightedLeastSquaresSmall(design, m, n, y, variances);
    if (!sol.ok) return null;
    const sigma0 = sol.dof > 0 ? Math.sqrt(sol.sigma0Sq) : NaN;
    if (sol.dof > 1 && rejected.length < MAX_REJECTIONS) {
      let worst = -1, worstW = OUTLIER_LIMIT;
      for (let i = 0; i < m; i++) {
        const w = Math.abs(sol.residuals[i]) / (sigma0 * Math.sqrt(Math.max(sol.qvvDiag[i], 1e-30)));
        if (w > worstW) { worstW = w; worst = i; }
      }
      if (worst >= 0 && m - 1 >= n) {
        rejected.push(active[worst].sat);
        active = active.filter((_, i) => i !== worst);
        continue;
      }
    }
    const v: EcefM = { x: sol.x[0], y: sol.x[1], z: sol.x[2] };
    const enu = ecefDeltaToEnu(v, g.latRad, g.lonRad);
    // Covariance rotated to ENU: C_enu = R C_xyz R^T, R the ECEF->ENU rotation (any geodesy text, e.g.
    // Misra & Enge 2011, eq. 6.29); variance factor sigma0^2 applied.
    const q = sol.qxx;
    const f = Number.isFinite(sigma0) ? sigma0 * sigma0 : NaN;
    const rot = [
      ecefDeltaToEnu({ x: 1, y: 0, z: 0 }, g.latRad, g.lonRad),
      ecefDeltaToEnu({ x: 0, y: 1, z: 0 }, g.latRad, g.lonRad),
      ecefDeltaToEnu({ x: 0, y: 0, z: 1 }, g.latRad, g.lonRad),
    ];
    const clockDriftMS: Partial<Record<GnssSystem, number>> = {};
    systems.forEach((s, i) => { clockDriftMS[s] = sol.x[3 + i]; });
    return {
      velocityEnuMS: enu,
      velocityEcefMS: v,
      speedMS: Math.hypot(enu.e, enu.n),
      sigmaEnuMS: { e: enuSigmaMS(rot, q, n, f, 'e'), n: enuSigmaMS(rot, q, n, f, 'n'), u: enuSigmaMS(rot, q, n, f, 'u') },
      sigma0,
      clockDriftMS,
      satellitesUsed: m,
      rejected,
    };
  }
}

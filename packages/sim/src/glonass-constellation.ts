/**
 * A simulated GLONASS constellation: true orbits integrated from the published equations of motion, and
 * broadcast ephemerides (state vectors in PZ-90 every 30 min) sampled from them.
 *
 * Nominal constellation (GLONASS ICD 5.1 (2008) section 3.1 / 4.1.1; from memory): 24 slots in 3 orbital
 * planes 120 deg apart in the longitude of the ascending node, 8 slots per plane 45 deg apart in argument of
 * latitude, the planes shifted by 15 deg against each other; slots 1-8 in plane 1, 9-16 in plane 2, 17-24
 * in plane 3, numbered against the direction of motion; inclination 64.8 deg; semi-major axis about
 * 25,510 km (draconic period 11 h 15 min 44 s); near-circular.
 *
 * Frequency channels k (FDMA; GLONASS ICD 5.1 3.3.1.1: f_G1 = 1602 MHz + k 0.5625 MHz): antipodal slots of
 * a plane (i and i + 4) share one k; the table is the assignment broadcast in the 2018 navigation files of
 * ../shared/data (cors-and-rover-2018-277/reference/glw1277m.18g: slots 1-23; slot 24 from its antipode 20).
 *
 * Truth: each satellite's state (ECEF, PZ-90) is integrated with RK4 at a 10 s step under the ICD's
 * equations of motion (central term, J2, Earth rotation; GLONASS ICD 5.1 appendix A.3.1.2) with no
 * luni-solar term, and kept as nodes every 30 s; between nodes a cubic Hermite through positions and
 * velocities (error below a micrometre at this spacing: h^4 |d4r/dt4| / 384 with |d4r/dt4| ~ n^4 a). The
 * broadcast records hold the truth at t_b rounded as RINEX writes it, with zero luni-solar accelerations,
 * so the receiver's propagator (orbit/glonass.ts: the same equations, RK4 from t_b) reproduces the truth to
 * well below a millimetre within the record's +-15 min.
 *
 * Issues: t_b every 30 min at 15 and 45 minutes past each UTC hour (as in broadcast files: common
 * practice); the clock -TauN + GammaN (t - t_b) samples one linear clock per satellite (ICD 3.3.3), so it
 * is continuous across issues. GLONASS system time is taken as GPS time here (no inter-system offset:
 * each constellation has its own clock state in the solvers).
 */
import type { GlonassEphemeris, SatId } from '@refdelta/core';
import { gpsToUtcS, PZ90, SECONDS_PER_WEEK } from '@refdelta/core';
import { Rng } from './rng.js';

/** Frequency channel k per slot 1..24 (see the module comment). */
export const GLONASS_NOMINAL_CHANNELS: readonly number[] = [
  1, -4, 5, 6, 1, -4, 5, 6, // plane 1: slots 1-8
  -2, -7, 0, -1, -2, -7, 0, -1, // plane 2: slots 9-16
  4, -3, 3, 2, 4, -3, 3, 2, // plane 3: slots 17-24
];

const DEG = Math.PI / 180;
/** Integration step (s) and node spacing (s) of the truth. */
const TRUTH_STEP_S = 10;
const NODE_SPACING_S = 30;
/** Issue period (s) and offset of t_b within the UTC hour (s). */
export const GLONASS_ISSUE_PERIOD_S = 1800;
const TB_OFFSET_S = 900;

/** Right-hand side of the GLONASS equations of motion (ICD 5.1 A.3.1.2) without luni-solar terms. */
function derivative(s: Float64Array, out: Float64Array): void {
  const x = s[0]!, y = s[1]!, z = s[2]!, vx = s[3]!, vy = s[4]!, vz = s[5]!;
  const r2 = x * x + y * y + z * z;
  const r = Math.sqrt(r2);
  const mu = PZ90.muM3S2, we = PZ90.omegaERadS, ae = PZ90.aeM;
  const muR3 = mu / (r2 * r);
  const j2 = (1.5 * PZ90.j2 * mu * ae * ae) / (r2 * r2 * r);
  const z2 = (5 * z * z) / r2;
  out[0] = vx; out[1] = vy; out[2] = vz;
  out[3] = -muR3 * x - j2 * x * (1 - z2) + we * we * x + 2 * we * vy;
  out[4] = -muR3 * y - j2 * y * (1 - z2) + we * we * y - 2 * we * vx;
  out[5] = -muR3 * z - j2 * z * (3 - z2);
}

function rk4(s: Float64Array, h: number): void {
  const k1 = new Float64Array(6), k2 = new Float64Array(6), k3 = new Float64Array(6), k4 = new Float64Array(6), t = new Float64Array(6);
  derivative(s, k1);
  for (let i = 0; i < 6; i++) t[i] = s[i]! + 0.5 * h * k1[i]!;
  derivative(t, k2);
  for (let i = 0; i < 6; i++) t[i] = s[i]! + 0.5 * h * k2[i]!;
  derivative(t, k3);
  for (let i = 0; i < 6; i++) t[i] = s[i]! + h * k3[i]!;
  derivative(t, k4);
  for (let i = 0; i < 6; i++) s[i] = s[i]! + (h / 6) * (k1[i]! + 2 * k2[i]! + 2 * k3[i]! + k4[i]!);
}

/** One satellite's true orbit (nodes) and clock. */
export class GlonassOrbitTruth {
  constructor(
    readonly sat: SatId,
    readonly channel: number,
    private readonly t0GpsS: number,
    private readonly nodes: Float64Array,
    private readonly clockAtT0S: number,
    readonly clockRateSS: number,
  ) {}

  get firstGpsS(): number { return this.t0GpsS; }
  get lastGpsS(): number { return this.t0GpsS + (this.nodes.length / 6 - 1) * NODE_SPACING_S; }

  /** Position (m) and velocity (m/s), ECEF PZ-90, at GPS time t into out[0..5]: cubic Hermite between nodes. */
  stateInto(tGpsS: number, out: Float64Array): void {
    const n = this.nodes.length / 6;
    const u = (tGpsS - this.t0GpsS) / NODE_SPACING_S;
    if (!(u >= 0 && u <= n - 1)) throw new RangeError(`${this.sat}: no simulated orbit at GPS time ${tGpsS}`);
    const i = Math.min(n - 2, Math.floor(u));
    const s = u - i;
    const h = NODE_SPACING_S;
    const a = this.nodes.subarray(6 * i, 6 * i + 6), b = this.nodes.subarray(6 * i + 6, 6 * i + 12);
    // Cubic Hermite basis on [0, 1] and its derivative (divided by h for d/dt).
    const s2 = s * s, s3 = s2 * s;
    const h00 = 2 * s3 - 3 * s2 + 1, h10 = s3 - 2 * s2 + s, h01 = -2 * s3 + 3 * s2, h11 = s3 - s2;
    const d00 = (6 * s2 - 6 * s) / h, d10 = 3 * s2 - 4 * s + 1, d01 = (-6 * s2 + 6 * s) / h, d11 = 3 * s2 - 2 * s;
    for (let c = 0; c < 3; c++) {
      const p0 = a[c]!, v0 = a[c + 3]!, p1 = b[c]!, v1 = b[c + 3]!;
      out[c] = h00 * p0 + h10 * h * v0 + h01 * p1 + h11 * h * v1;
      out[c + 3] = d00 * p0 + d10 * v0 + d01 * p1 + d11 * v1;
    }
  }

  /** True clock offset (s) of the broadcast polynomial's continuous clock. */
  clockOffsetS(tGpsS: number): number {
    return this.clockAtT0S + this.clockRateSS * (tGpsS - this.t0GpsS);
  }
}

/** Rounds as RINEX D19.12 writes a value (12 digits after the point of the mantissa). */
function rinexRound(v: number): number {
  if (v === 0 || !Number.isFinite(v)) return v;
  return Number(v.toExponential(12));
}

export interface SimulatedGlonass {
  readonly ephemerides: GlonassEphemeris[];
  readonly truth: Map<SatId, GlonassOrbitTruth>;
  /** Slot -> frequency channel k (the GLONASS SLOT / FRQ # header record). */
  readonly channels: Map<number, number>;
}

/**
 * The constellation over [startGpsS - 4 h, endGpsS + 4 h]: truth orbits and broadcast records every 30 min.
 * `tRef` is the instant the nominal elements refer to (the start of the scenario's day).
 */
export function simulateGlonass(seed: number | string, startGpsS: number, endGpsS: number, tRef: number): SimulatedGlonass {
  const rng = new Rng(seed, 'constellation', 'R');
  const raan0 = rng.between(0, 2 * Math.PI);
  const u0 = rng.between(0, 2 * Math.PI);
  // Records: t_b at 15 and 45 minutes past the UTC hour; the truth spans them with half an issue period to spare (a record propagated to its ends).
  const utcOffsetS = startGpsS - gpsToUtcS(startGpsS);
  const firstTbUtc = Math.floor((gpsToUtcS(startGpsS - 4 * 3600) - TB_OFFSET_S) / GLONASS_ISSUE_PERIOD_S) * GLONASS_ISSUE_PERIOD_S + TB_OFFSET_S;
  const lastTbUtc = Math.ceil((gpsToUtcS(endGpsS + 4 * 3600) - TB_OFFSET_S) / GLONASS_ISSUE_PERIOD_S) * GLONASS_ISSUE_PERIOD_S + TB_OFFSET_S;
  // Every t_b falls on a node (the issue period is a multiple of the node spacing): records hold integrated
  // states, not interpolated ones (an interpolated velocity would drift the propagated orbit by a millimetre).
  const t0 = firstTbUtc + utcOffsetS - GLONASS_ISSUE_PERIOD_S;
  const t1 = lastTbUtc + utcOffsetS + GLONASS_ISSUE_PERIOD_S;
  const nodeCount = Math.ceil((t1 - t0) / NODE_SPACING_S) + 1;
  const we = PZ90.omegaERadS;
  const truth = new Map<SatId, GlonassOrbitTruth>();
  const ephemerides: GlonassEphemeris[] = [];
  const channels = new Map<number, number>();
  for (let slot = 1; slot <= 24; slot++) {
    const plane = Math.floor((slot - 1) / 8);
    const inPlane = (slot - 1) % 8;
    const sat = `R${String(slot).padStart(2, '0')}` as SatId;
    const k = GLONASS_NOMINAL_CHANNELS[slot - 1]!;
    channels.set(slot, k);
    // Osculating elements at tRef (seeded deviations of a few hundred metres / tenths of a degree).
    const aM = 25_510_000 + rng.between(-1000, 1000);
    const e = rng.between(2e-4, 2e-3);
    const inc = (64.8 + rng.between(-0.3, 0.3)) * DEG;
    const omega = rng.between(-Math.PI, Math.PI);
    const argLat = u0 - inPlane * 45 * DEG + plane * 15 * DEG + rng.between(-0.3, 0.3) * DEG;
    const nodeLon = raan0 + plane * 120 * DEG + rng.between(-0.3, 0.3) * DEG; // node longitude from Greenwich at tRef
    const n0 = Math.sqrt(PZ90.muM3S2 / (aM * aM * aM));
    // Mean anomaly from the argument of latitude (circular enough that the true-to-mean difference does
    // not matter for a plausible constellation).
    const m = argLat - omega;
    // Kepler's equation for E, then the perifocal state (e.g. Montenbruck & Gill 2000, 2.2).
    let E = m;
    for (let it = 0; it < 10; it++) E = m + e * Math.sin(E);
    const cosE = Math.cos(E), sinE = Math.sin(E);
    const r = aM * (1 - e * cosE);
    const xp = aM * (cosE - e), yp = aM * Math.sqrt(1 - e * e) * sinE;
    const vxp = (-aM * n0 * sinE * aM) / r, vyp = (aM * n0 * Math.sqrt(1 - e * e) * cosE * aM) / r;
    // Perifocal -> frame with x to Greenwich at tRef: R3(-Omega) R1(-i) R3(-omega).
    const cO = Math.cos(nodeLon), sO = Math.sin(nodeLon), ci = Math.cos(inc), si = Math.sin(inc), cw = Math.cos(omega), sw = Math.sin(omega);
    const px = cO * cw - sO * sw * ci, py = sO * cw + cO * sw * ci, pz = sw * si;
    const qx = -cO * sw - sO * cw * ci, qy = -sO * sw + cO * cw * ci, qz = cw * si;
    const rin = [px * xp + qx * yp, py * xp + qy * yp, pz * xp + qz * yp];
    const vin = [px * vxp + qx * vyp, py * vxp + qy * vyp, pz * vxp + qz * vyp];
    // Inertial (aligned with ECEF at tRef) -> ECEF at tRef: v_ecef = v_in - omega x r.
    const s = new Float64Array([rin[0]!, rin[1]!, rin[2]!, vin[0]! + we * rin[1]!, vin[1]! - we * rin[0]!, vin[2]!]);
    // Integrate from tRef to t0 (either way), then along the nodes.
    let t = tRef;
    const step = (target: number) => {
      while (Math.abs(target - t) > 1e-9) {
        const h = Math.sign(target - t) * Math.min(TRUTH_STEP_S, Math.abs(target - t));
        rk4(s, h);
        t += h;
      }
    };
    step(t0);
    const nodes = new Float64Array(6 * nodeCount);
    for (let i = 0; i < nodeCount; i++) {
      step(t0 + i * NODE_SPACING_S);
      nodes.set(s, 6 * i);
    }
    const clock0 = rng.between(-2e-4, 2e-4);
    const rate = rng.between(-5e-12, 5e-12);
    const orbit = new GlonassOrbitTruth(sat, k, t0, nodes, clock0, rate);
    truth.set(sat, orbit);
    const st = new Float64Array(6);
    for (let tbUtc = firstTbUtc; tbUtc <= lastTbUtc; tbUtc += GLONASS_ISSUE_PERIOD_S) {
      const tbGpsS = tbUtc + utcOffsetS;
      orbit.stateInto(tbGpsS, st);
      const weekStartUtc = Math.floor(tbUtc / SECONDS_PER_WEEK) * SECONDS_PER_WEEK;
      ephemerides.push({
        kind: 'glonass', sat, system: 'R', message: '',
        tbGpsS,
        clockBiasS: rinexRound(orbit.clockOffsetS(tbGpsS)),
        gammaN: rinexRound(rate),
        frameTimeS: tbUtc - TB_OFFSET_S - weekStartUtc,
        // RINEX writes km, km/s: round in those units.
        posM: [rinexRound(st[0]! / 1000) * 1000, rinexRound(st[1]! / 1000) * 1000, rinexRound(st[2]! / 1000) * 1000],
        velMS: [rinexRound(st[3]! / 1000) * 1000, rinexRound(st[4]! / 1000) * 1000, rinexRound(st[5]! / 1000) * 1000],
        accMS2: [0, 0, 0],
        health: 0, channel: k, ageDays: 0,
        file: 'simulated', line: 0,
      });
    }
  }
  return { ephemerides, truth, channels };
}

/**
 * A plausible simulated broadcast constellation: Keplerian ephemerides for GPS and Galileo, and GLONASS
 * state vectors (glonass-constellation.ts: truth orbits integrated from the ICD's equations of motion).
 *
 * Nominal orbits (from memory): GPS, 6 planes A-F with right ascensions of the ascending node 60 deg
 * apart, 55 deg inclination, semi-major axis 26,559.7 km, near-circular (nominal constellation, e.g. GPS
 * SPS Performance Standard 2020 section 3.2 / IS-GPS-200 20.3.3.4.3); Galileo, Walker 24/3/1, 3 planes
 * 120 deg apart, 56 deg, 29,600 km (Galileo OS SIS ICD 2.1 / OS SDD, nominal constellation).
 *
 * Every issue of a satellite describes one and the same orbit (the same Keplerian ellipse, with the same
 * secular node drift, harmonic corrections and inclination rate), re-referenced to its own toe: so the
 * orbit given by the broadcast user algorithm (IS-GPS-200 table 20-IV) is continuous across issues and
 * the simulator's truth can be "the broadcast orbit plus a controlled error". The same holds for the clock
 * polynomial (af2 = 0, af0 moved along af1 to each toc).
 *
 * Issues: GPS toe/toc every 2 h on the even hour, IODE = IODC incrementing (mod 256), fit interval 4 h,
 * transmitted 2 h 1 min before toe (as seen in broadcast files: common practice). Galileo (I/NAV, E1-B
 * data source, E5b/E1 clock): toe every hour (the real system refreshes every 10 min; one hour keeps files
 * small), IODnav incrementing (mod 1024), transmitted 9 min before toe.
 */
import type { GnssSystem } from '@refdelta/core';
import type { Ephemeris, KeplerEphemeris, KlobucharCoefficients, NavData } from '@refdelta/core';
import { GALILEO_CONSTANTS, GPS_CONSTANTS } from '@refdelta/core';
import { SECONDS_PER_WEEK } from '@refdelta/core';
import { Rng } from './rng.js';
import { simulateGlonass, type GlonassOrbitTruth } from './glonass-constellation.js';

/** The true GLONASS orbits behind a simulated navigation set (its records are samples of them). */
const glonassTruth = new WeakMap<NavData, ReadonlyMap<string, GlonassOrbitTruth>>();

/** True GLONASS orbits and clocks of a navigation set made by simulateConstellation (empty otherwise). */
export function glonassTruthOf(nav: NavData): ReadonlyMap<string, GlonassOrbitTruth> {
  return glonassTruth.get(nav) ?? new Map();
}

/** GLONASS slot -> frequency channel of a simulated navigation set. */
export function glonassChannelsOf(nav: NavData): Map<number, number> {
  const m = new Map<number, number>();
  for (const [sat, t] of glonassTruthOf(nav)) m.set(Number(sat.slice(1)), t.channel);
  return m;
}

/**
 * A typical broadcast Klobuchar set (values of the kind seen in GPS navigation headers of a quiet
 * mid-latitude day; e.g. the ION ALPHA/BETA of a 2018 broadcast file: common practice).
 */
export const TYPICAL_KLOBUCHAR: KlobucharCoefficients = {
  alpha: [1.1176e-8, 7.4506e-9, -5.9605e-8, -5.9605e-8],
  beta: [9.0112e4, 0, -1.9661e5, -6.5536e4],
};

/** Typical Galileo NeQuick effective-ionisation coefficients ai0, ai1, ai2 (from memory). */
export const TYPICAL_NEQUICK: readonly [number, number, number] = [62.75, 0.2617, 0.0016];

/** Leap seconds GPS - UTC since 2017-01-01 (IERS Bulletin C; check-values.md constants). */
export const SIM_LEAP_SECONDS = 18;

export interface ConstellationSpec {
  readonly seed: number | string;
  /** Span that the ephemerides must cover (GPS s); issues are added 4 h either side. */
  readonly startGpsS: number;
  readonly endGpsS: number;
  readonly systems: readonly ('G' | 'E' | 'R')[];
}

/** The orbit and clock of one simulated satellite at a reference instant. */
interface SatelliteElements {
  readonly sat: string;
  readonly system: 'G' | 'E';
  readonly sqrtA: number;
  readonly e: number;
  readonly i0: number;
  readonly idot: number;
  readonly omega: number;
  /** Mean anomaly (rad) at tRef. */
  readonly m0Ref: number;
  readonly deltaN: number;
  /** Inertial right ascension of the node at tRef, counted from the Greenwich meridian at GPS time 0 (rad). */
  readonly raanRef: number;
  readonly omegaDot: number;
  readonly crs: number; readonly crc: number;
  readonly cus: number; readonly cuc: number;
  readonly cis: number; readonly cic: number;
  readonly af0Ref: number;
  readonly af1: number;
  readonly tgdS: number;
  readonly tgd2S: number;
  readonly iodBase: number;
}

function wrapPi(a: number): number {
  const t = a - 2 * Math.PI * Math.floor((a + Math.PI) / (2 * Math.PI));
  return t;
}

const DEG = Math.PI / 180;

/** GPS: 6 planes; planes A-C carry 5 satellites, D-F 4 (27 in all). PRNs a seeded permutation of 1..32. */
function gpsElements(seed: number | string, tRef: number): SatelliteElements[] {
  const rng = new Rng(seed, 'constellation', 'G');
  const prns = rng.shuffled(Array.from({ length: 32 }, (_, i) => i + 1));
  const raan0 = rng.between(0, 2 * Math.PI);
  const out: SatelliteElements[] = [];
  let k = 0;
  for (let plane = 0; plane < 6; plane++) {
    const slots = plane < 3 ? 5 : 4;
    for (let slot = 0; slot < slots; slot++) {
      const prn = prns[k++]!;
      const aM = 26_559_700 + rng.between(-30, 30) * 1000 * 0.01; // +-300 m around the nominal 26,559.7 km
      out.push({
        sat: `G${String(prn).padStart(2, '0')}`,
        system: 'G',
        sqrtA: Math.sqrt(aM),
        e: rng.between(0.001, 0.015),
        i0: (55 + rng.between(-1.5, 1.5)) * DEG,
        idot: rng.between(-3e-10, 3e-10),
        omega: rng.between(-Math.PI, Math.PI),
        m0Ref: wrapPi((2 * Math.PI * slot) / slots + plane * (Math.PI / 15) + rng.between(-0.05, 0.05)),
        deltaN: rng.between(3.8e-9, 5.2e-9),
        raanRef: raan0 + plane * 60 * DEG + rng.between(-0.5, 0.5) * DEG,
        omegaDot: rng.between(-8.3e-9, -7.7e-9),
        crs: rng.between(-120, 120), crc: rng.between(150, 320),
        cus: rng.between(2e-6, 1.2e-5), cuc: rng.between(-6e-6, 6e-6),
        cis: rng.between(-2e-7, 2e-7), cic: rng.between(-2e-7, 2e-7),
        af0Ref: rng.between(-6e-4, 6e-4),
        af1: rng.between(-1.2e-11, 1.2e-11),
        tgdS: rng.between(-2e-8, 1e-8),
        tgd2S: NaN,
        iodBase: rng.int(0, 255),
      });
    }
  }
  return out;
}

/** Galileo: Walker 24/3/1 (3 planes x 8 slots, 15 deg phasing between planes); PRNs a permutation of 1..36. */
function galileoElements(seed: number | string, tRef: number): SatelliteElements[] {
  const rng = new Rng(seed, 'constellation', 'E');
  const prns = rng.shuffled(Array.from({ length: 36 }, (_, i) => i + 1));
  const raan0 = rng.between(0, 2 * Math.PI);
  const out: SatelliteElements[] = [];
  let k = 0;
  for (let plane = 0; plane < 3; plane++) {
    for (let slot = 0; slot < 8; slot++) {
      const prn = prns[k++]!;
      const aM = 29_600_000 + rng.between(-200, 200);
      out.push({
        sat: `E${String(prn).padStart(2, '0')}`,
        system: 'E',
        sqrtA: Math.sqrt(aM),
        e: rng.between(1e-4, 6e-4),
        i0: (56 + rng.between(-0.5, 0.5)) * DEG,
        idot: rng.between(-2e-10, 2e-10),
        omega: rng.between(-Math.PI, Math.PI),
        m0Ref: wrapPi((2 * Math.PI * slot) / 8 + plane * 15 * DEG + rng.between(-0.02, 0.02)),
        deltaN: rng.between(2.6e-9, 3.4e-9),
        raanRef: raan0 + plane * 120 * DEG + rng.between(-0.3, 0.3) * DEG,
        omegaDot: rng.between(-5.8e-9, -5.3e-9),
        crs: rng.between(-60, 60), crc: rng.between(100, 250),
        cus: rng.between(2e-6, 9e-6), cuc: rng.between(-4e-6, 4e-6),
        cis: rng.between(-1e-7, 1e-7), cic: rng.between(-1e-7, 1e-7),
        af0Ref: rng.between(-8e-4, 8e-4),
        af1: rng.between(-8e-12, 8e-12),
        tgdS: rng.between(-1e-8, 1e-8),
        tgd2S: rng.between(-1e-8, 1e-8),
        iodBase: rng.int(0, 1023),
      });
    }
  }
  void tRef;
  return out;
}

/** One issue of a satellite's ephemeris, re-referenced to toe (see the module comment). */
function issue(el: SatelliteElements, tRef: number, toeGpsS: number, k: number): KeplerEphemeris {
  const c = el.system === 'G' ? GPS_CONSTANTS : GALILEO_CONSTANTS;
  const aM = el.sqrtA * el.sqrtA;
  const n = Math.sqrt(c.muM3S2 / (aM * aM * aM)) + el.deltaN; // IS-GPS-200 table 20-IV: n = n0 + deltaN
  const dt = toeGpsS - tRef;
  const weekStartGpsS = Math.floor(toeGpsS / SECONDS_PER_WEEK) * SECONDS_PER_WEEK;
  // IS-GPS-200 table 20-IV: Omega_k = Omega0 + (OmegaDot - omegaE) tk - omegaE toe; with the inertial node
  // longitude raan(t) = raanRef + OmegaDot (t - tRef) counted from Greenwich at GPS time 0, the ECEF node
  // longitude is raan(t) - omegaE t, so Omega0 = raan(toe) - omegaE (start of the toe week).
  // omegaE * weekStart reduced week by week modulo 2 pi, so no precision is lost on the large product.
  const perWeekRad = (c.omegaERadS * SECONDS_PER_WEEK) % (2 * Math.PI);
  const weeks = weekStartGpsS / SECONDS_PER_WEEK;
  const omega0 = wrapPi(el.raanRef + el.omegaDot * dt - ((weeks * perWeekRad) % (2 * Math.PI)));
  const isGps = el.system === 'G';
  const iod = isGps ? (el.iodBase + k) % 256 : (el.iodBase + k) % 1024;
  return {
    kind: 'kepler',
    sat: el.sat,
    system: el.system,
    message: '',
    tocGpsS: toeGpsS,
    toeGpsS,
    toeSowS: toeGpsS - weekStartGpsS,
    af0: el.af0Ref + el.af1 * dt, // clock polynomial carried to toc (IS-GPS-200 20.3.3.3.3.1 with af2 = 0)
    af1: el.af1,
    af2: 0,
    iode: iod,
    iodc: isGps ? iod : NaN,
    crs: el.crs,
    deltaN: el.deltaN,
    m0: wrapPi(el.m0Ref + n * dt),
    cuc: el.cuc,
    e: el.e,
    cus: el.cus,
    sqrtA: el.sqrtA,
    cic: el.cic,
    omega0,
    cis: el.cis,
    i0: el.i0 + el.idot * dt,
    crc: el.crc,
    omega: el.omega,
    omegaDot: el.omegaDot,
    idot: el.idot,
    accuracyM: isGps ? 2.0 : 3.12, // URA index 0 (IS-GPS-200 20.3.3.3.1.3); SISA 3.12 m (typical broadcast value, from memory)
    health: 0,
    tgdS: el.tgdS,
    tgd2S: el.tgd2S,
    dataSource: isGps ? 0 : 517, // Galileo: I/NAV E1-B + E5b-I, clock E5b/E1 (RINEX 3.04 table A8 bits 0, 2, 9)
    transmitGpsS: isGps ? toeGpsS - 7260 : toeGpsS - 540,
    fitIntervalH: isGps ? 4 : NaN,
    file: 'simulated',
    line: 0,
  };
}

/** Issue period per system (s): see the module comment. */
export function issuePeriodS(system: 'G' | 'E'): number {
  return system === 'G' ? 7200 : 3600;
}

/**
 * Broadcast ephemerides of the simulated constellation covering [startGpsS - 4 h, endGpsS + 4 h], in time
 * order (then satellite order), with a typical Klobuchar set, NeQuick coefficients and leap seconds.
 */
export function simulateConstellation(spec: ConstellationSpec): NavData {
  const tRef = Math.floor(spec.startGpsS / 86_400) * 86_400; // reference instant: the start of the day
  const elements: SatelliteElements[] = [];
  if (spec.systems.includes('G')) elements.push(...gpsElements(spec.seed, tRef));
  if (spec.systems.includes('E')) elements.push(...galileoElements(spec.seed, tRef));
  elements.sort((a, b) => (a.sat < b.sat ? -1 : a.sat > b.sat ? 1 : 0));
  const ephemerides: Ephemeris[] = [];
  const systems: GnssSystem[] = ['G', 'E'];
  for (const sys of systems) {
    const step = issuePeriodS(sys as 'G' | 'E');
    const first = Math.floor((spec.startGpsS - 4 * 3600) / step) * step;
    const last = Math.ceil((spec.endGpsS + 4 * 3600) / step) * step;
    for (let toe = first, k = Math.round((first - tRef) / step); toe <= last; toe += step, k++) {
      for (const el of elements) if (el.system === sys) ephemerides.push(issue(el, tRef, toe, ((k % 1024) + 1024) % 1024));
    }
  }
  const glo = spec.systems.includes('R') ? simulateGlonass(spec.seed, spec.startGpsS, spec.endGpsS, tRef) : null;
  if (glo) ephemerides.push(...glo.ephemerides);
  const refTime = (e: Ephemeris) => (e.kind === 'kepler' ? e.toeGpsS : e.kind === 'glonass' ? e.tbGpsS : e.t0GpsS);
  ephemerides.sort((a, b) => refTime(a) - refTime(b) || (a.sat < b.sat ? -1 : a.sat > b.sat ? 1 : 0));
  const nav: NavData = {
    files: ['simulated'],
    version: 3.04,
    ephemerides,
    ionosphere: {
      ...(spec.systems.includes('G') ? { gps: TYPICAL_KLOBUCHAR } : {}),
      ...(spec.systems.includes('E') ? { galileo: TYPICAL_NEQUICK } : {}),
    },
    leapSeconds: SIM_LEAP_SECONDS,
  };
  if (glo) glonassTruth.set(nav, glo.truth);
  return nav;
}

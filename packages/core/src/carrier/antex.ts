/**
 * Receiver-antenna calibrations in the ANTEX format (IGS open standard, ANTEX 1.4, Rothacher & Schmid 2010):
 * per antenna type (TYPE / SERIAL NO, columns 1-20: antenna and radome) and frequency (e.g. 'G01'), the
 * phase-centre offset NORTH / EAST / UP from the antenna reference point (mm) and the phase-centre
 * variations on a zenith grid (ZEN1 / ZEN2 / DZEN), without azimuth ('NOAZI') and, when DAZI > 0, by
 * azimuth too (mm). Satellite antennas (a serial of the form 'G01') are skipped.
 *
 * The range measured to the phase centre is rho(ARP) - e . PCO + PCV(zenith, azimuth), with e the unit
 * vector to the satellite (ANTEX 1.4 format description, section on the sign convention; from memory), so
 * e . PCO - PCV is added to a phase measurement to refer it to the antenna reference point.
 */
import { InputError } from '../errors.js';
import type { GnssSystem } from '../gnss/index.js';

export interface FrequencyCalibration {
  /** Phase-centre offset north, east, up (m). */
  readonly offsetNeuM: readonly [number, number, number];
  /** PCV without azimuth on the zenith grid (m). */
  readonly noAzimuthM: Float64Array;
  /** PCV by azimuth: rows of azimuth (0, dazi, ... 360) each on the zenith grid (m); empty when DAZI = 0. */
  readonly byAzimuthM: readonly Float64Array[];
}

export interface AntennaCalibration {
  readonly type: string;
  readonly zenith1Deg: number;
  readonly zenith2Deg: number;
  readonly dZenithDeg: number;
  readonly dAzimuthDeg: number;
  readonly frequencies: ReadonlyMap<string, FrequencyCalibration>;
}

export interface AntexData {
  readonly file: string;
  /** Receiver antennas by type (antenna and radome, as in RINEX headers: 20 columns, trimmed). */
  readonly antennas: ReadonlyMap<string, AntennaCalibration>;
}

const label = (line: string): string => line.slice(60).trim();

export function readAntex(file: string, text: string): AntexData {
  const lines = text.split(/\r?\n/);
  const antennas = new Map<string, AntennaCalibration>();
  let i = 0;
  const num = (s: string, ln: number, what: string): number => {
    const v = Number(s.trim().replace(/^\+/, ''));
    if (!Number.isFinite(v)) throw new InputError(file, ln + 1, `${what} is not a number ('${s.trim()}')`);
    return v;
  };
  while (i < lines.length && label(lines[i]) !== 'END OF HEADER') {
    if (i === 0 && !lines[0].includes('ANTEX VERSION')) throw new InputError(file, 1, 'expected an ANTEX file (first line labelled ANTEX VERSION / SYST)');
    i++;
  }
  if (i >= lines.length) throw new InputError(file, lines.length, 'no END OF HEADER line: not an ANTEX file');
  for (; i < lines.length; i++) {
    if (label(lines[i]) !== 'START OF ANTENNA') continue;
    let type = '', serial = '';
    let z1 = 0, z2 = 90, dz = 5, dazi = 0;
    const freqs = new Map<string, FrequencyCalibration>();
    for (i++; i < lines.length && label(lines[i]) !== 'END OF ANTENNA'; i++) {
      const l = lines[i], lab = label(l);
      if (lab === 'TYPE / SERIAL NO') { type = l.slice(0, 20).trim(); serial = l.slice(20, 40).trim(); }
      else if (lab === 'DAZI') dazi = num(l.slice(2, 8), i, 'DAZI');
      else if (lab === 'ZEN1 / ZEN2 / DZEN') { z1 = num(l.slice(2, 8), i, 'ZEN1'); z2 = num(l.slice(8, 14), i, 'ZEN2'); dz = num(l.slice(14, 20), i, 'DZEN'); }
      else if (lab === 'START OF FREQUENCY') {
        const key = l.slice(3, 6).trim();
        let neu: [number, number, number] = [0, 0, 0];
        let noazi = new Float64Array(0);
        const rows: Float64Array[] = [];
        for (i++; i < lines.length && label(lines[i]) !== 'END OF FREQUENCY'; i++) {
          const f = lines[i];
          if (label(f) === 'NORTH / EAST / UP') {
            neu = [num(f.slice(0, 10), i, 'NORTH'), num(f.slice(10, 20), i, 'EAST'), num(f.slice(20, 30), i, 'UP')].map((v) => v / 1000) as [number, number, number];
          } else if (f.startsWith('   NOAZI')) {
            noazi = Float64Array.from(f.slice(8).trim().split(/\s+/).map((s) => num(s, i, 'NOAZI value') / 1000));
          } else if (dazi > 0 && /^\s*[+-]?\d+\.\d/.test(f.slice(0, 8)) && !label(f).includes('/')) {
            const parts = f.slice(8).trim().split(/\s+/);
            rows.push(Float64Array.from(parts.map((s) => num(s, i, 'PCV value') / 1000)));
          }
        }
        freqs.set(key, { offsetNeuM: neu, noAzimuthM: noazi, byAzimuthM: rows });
      }
    }
    if (/^[GRECJSI]\d\d$/.test(serial)) continue; // a satellite antenna
    if (type && !antennas.has(type)) antennas.set(type, { type, zenith1Deg: z1, zenith2Deg: z2, dZenithDeg: dz, dAzimuthDeg: dazi, frequencies: freqs });
  }
  return { file, antennas };
}

/** The calibration of an antenna type from a RINEX header; a type without radome also matches 'NONE'. */
export function findAntenna(data: AntexData, rinexType: string): AntennaCalibration | null {
  const t = rinexType.trim();
  if (!t) return null;
  const hit = data.antennas.get(t);
  if (hit) return hit;
  const name = t.slice(0, 16).trim();
  return data.antennas.get(`${name.padEnd(16)}NONE`) ?? data.antennas.get(name) ?? null;
}

function gridValue(values: Float64Array, cal: AntennaCalibration, zenithDeg: number): number {
  if (values.length === 0) return 0;
  const f = (Math.min(Math.max(zenithDeg, cal.zenith1Deg), cal.zenith2Deg) - cal.zenith1Deg) / cal.dZenithDeg;
  const i = Math.min(Math.floor(f), values.length - 2);
  if (i < 0) return values[0];
  const w = f - i;
  return values[i] + w * (values[i + 1] - values[i]);
}

/** Phase-centre variation (m) at a zenith and azimuth (deg): bilinear on the azimuth grid when given, else NOAZI. */
export function phaseCentreVariationM(cal: AntennaCalibration, f: FrequencyCalibration, zenithDeg: number, azimuthDeg: number): number {
  if (cal.dAzimuthDeg > 0 && f.byAzimuthM.length >= 2) {
    const a = ((azimuthDeg % 360) + 360) % 360 / cal.dAzimuthDeg;
    const i = Math.min(Math.floor(a), f.byAzimuthM.length - 2);
    const w = a - i;
    return (1 - w) * gridValue(f.byAzimuthM[i], cal, zenithDeg) + w * gridValue(f.byAzimuthM[i + 1], cal, zenithDeg);
  }
  return gridValue(f.noAzimuthM, cal, zenithDeg);
}

/**
 * The correction (m) to add to a phase measurement of a system's band to refer it to the antenna reference
 * point: e . PCO - PCV. GLONASS, Galileo, BeiDou or QZSS without their own entry use the GPS one of the
 * same band number (common practice); 0 when the antenna has no entry for the band.
 */
export function antennaCorrectionM(cal: AntennaCalibration, system: GnssSystem, band: string, elevationRad: number, azimuthRad: number): number {
  const f = cal.frequencies.get(`${system}0${band}`) ?? cal.frequencies.get(`G0${band}`);
  if (!f) return 0;
  const ce = Math.cos(elevationRad);
  const e = ce * Math.cos(azimuthRad), n = ce * Math.sin(azimuthRad);
  void e;
  // Unit vector to the satellite: north = cos(el) cos(az), east = cos(el) sin(az), up = sin(el).
  const north = ce * Math.cos(azimuthRad), east = n, up = Math.sin(elevationRad);
  const proj = north * f.offsetNeuM[0] + east * f.offsetNeuM[1] + up * f.offsetNeuM[2];
  return proj - phaseCentreVariationM(cal, f, 90 - elevationRad * 180 / Math.PI, azimuthRad * 180 / Math.PI);
}

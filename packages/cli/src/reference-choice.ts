/**
 * How the user gave the reference coordinate, and its resolution to a framed ECEF coordinate of the
 * reference ground mark.
 */
import {
  GRS80, InputError, WGS84, decimalYearFromGpsS, degToRad, geodeticToEcef,
  type EcefM, type FrameEpoch, type FramedEcef, type ObsHeader, type Warning,
} from '@refdelta/core';
import { parseNumber } from './parse-values.js';
import { requireKnownFrame } from './frame-check.js';
import { UsageError } from './usage-error.js';

export type ReferenceChoice =
  | { readonly mode: 'xyz'; readonly form: 'ecef' | 'geodetic'; readonly ecef: EcefM; readonly frame: FrameEpoch }
  | { readonly mode: 'header'; readonly frameName?: string; readonly epochYear?: number }
  | { readonly mode: 'mark'; readonly markName: string; readonly marksFile: string; readonly frameName?: string; readonly epochYear?: number };

export interface ReferenceArgs {
  /** --ref-coord: the one reference-coordinate option; its form is recognised from its content. */
  readonly refCoord?: unknown;
  readonly marks?: unknown;
  readonly refFrame?: unknown;
  readonly refEpoch?: unknown;
  readonly allowUnknownFrame?: unknown;
}

/** The forms --ref-coord accepts, named in every error about it. */
export const REF_COORD_FORMS =
  "X,Y,Z (ECEF metres, 6300-6400 km from the geocentre), LAT,LON,H (degrees, degrees, ellipsoidal metres), " +
  "a mark name from --marks FILE, or 'header' (the reference file's APPROX POSITION XYZ)";

function frameNameOf(v: unknown, allowUnknown: boolean): string | undefined {
  if (v === undefined || v === null) return undefined;
  const s = String(v).trim();
  if (s === '') throw new UsageError('--ref-frame expects a frame name such as ITRF2014, ETRF2000 or WGS84');
  return requireKnownFrame(s, '--ref-frame', allowUnknown);
}

function epochOf(v: unknown): number | undefined {
  if (v === undefined || v === null) return undefined;
  // Frames are realised from 1980 on (GPS era); a coordinate epoch outside 1980-2100 is a typing slip.
  return parseNumber('ref-epoch', v, 1980, 2100);
}

type Recognised = { form: 'ecef'; x: number; y: number; z: number } | { form: 'geodetic'; lat: number; lon: number; h: number } | { form: 'header' } | { form: 'mark'; name: string };

/** The form of a --ref-coord value, from its content alone; a UsageError naming the forms when none fits. */
export function recogniseRefCoord(value: string, marksGiven: boolean): Recognised {
  const v = value.trim();
  if (/^header$/i.test(v)) return { form: 'header' };
  const parts = v.split(',').map((p) => p.trim());
  const numeric = parts.length >= 2 && parts.every((p) => p !== '' && Number.isFinite(Number(p)));
  if (numeric) {
    if (parts.length !== 3) throw new UsageError(`--ref-coord '${v}' has ${parts.length} numbers; expected three: ${REF_COORD_FORMS}`);
    const [a, b, c] = parts.map(Number) as [number, number, number];
    const r = Math.hypot(a, b, c);
    // Between 6300 km and 6400 km from the geocentre: the Earth's surface +-30 km (WGS-84 a = 6378.137 km, b = 6356.752 km).
    if (r >= 6.3e6 && r <= 6.4e6) return { form: 'ecef', x: a, y: b, z: c };
    if (Math.abs(a) <= 90 && b >= -180 && b <= 360 && c >= -1000 && c <= 10000) return { form: 'geodetic', lat: a, lon: b, h: c };
    throw new UsageError(`--ref-coord '${v}' is neither ECEF metres near the Earth's surface (${(r / 1000).toFixed(1)} km from the centre) nor latitude/longitude/height within -90..90 deg, -180..360 deg, -1000..10000 m; expected ${REF_COORD_FORMS}`);
  }
  if (v === '' || /[,;]/.test(v)) throw new UsageError(`--ref-coord '${v}' matches none of its forms: ${REF_COORD_FORMS}`);
  if (!marksGiven) throw new UsageError(`--ref-coord '${v}' is not a coordinate, so it would be a mark name, but no --marks FILE was given to look it up in; expected ${REF_COORD_FORMS}`);
  return { form: 'mark', name: v };
}

/** The reference coordinate as given; a UsageError for none, an unrecognised form, or a missing frame. */
export function parseReferenceChoice(a: ReferenceArgs): ReferenceChoice {
  if (a.refCoord === undefined || a.refCoord === null || a.refCoord === true) {
    throw new UsageError(`give the reference coordinate with --ref-coord: ${REF_COORD_FORMS}`);
  }
  if (Array.isArray(a.refCoord)) throw new UsageError('give --ref-coord once');
  const allowUnknown = a.allowUnknownFrame === true;
  const marksGiven = a.marks !== undefined && String(a.marks).trim() !== '';
  const r = recogniseRefCoord(String(a.refCoord), marksGiven);
  const frameName = frameNameOf(a.refFrame, allowUnknown);
  const epochYear = epochOf(a.refEpoch);
  if (r.form === 'ecef' || r.form === 'geodetic') {
    if (frameName === undefined || epochYear === undefined) {
      throw new UsageError(`--ref-coord with ${r.form === 'ecef' ? 'ECEF' : 'latitude/longitude/height'} values needs --ref-frame NAME and --ref-epoch YEAR (the coordinate's frame and epoch, e.g. --ref-frame ITRF2014 --ref-epoch 2024.37)`);
    }
    const frame: FrameEpoch = { name: frameName, epochYear };
    if (r.form === 'ecef') return { mode: 'xyz', form: 'ecef', ecef: { x: r.x, y: r.y, z: r.z }, frame };
    // GRS80 for ITRF/ETRF-type frames, WGS-84 for WGS 84 labels: they differ by 0.1 mm in height (NIMA TR8350.2 3.2).
    const ell = /^wgs/i.test(frameName) ? WGS84 : GRS80;
    const ecef = geodeticToEcef({ latRad: degToRad(r.lat), lonRad: degToRad(r.lon), heightM: r.h }, ell);
    return { mode: 'xyz', form: 'geodetic', ecef, frame };
  }
  if (r.form === 'header') return { mode: 'header', frameName, epochYear };
  return { mode: 'mark', markName: r.name, marksFile: String(a.marks), frameName, epochYear };
}

export interface ResolvedReference {
  readonly position: FramedEcef;
  /** Words for the summary: where the coordinate came from. */
  readonly source: string;
  readonly note: string;
}

/** The header coordinate as the reference, with the cautions that come with it. */
export function referenceFromHeader(
  choice: Extract<ReferenceChoice, { mode: 'header' }>,
  header: ObsHeader,
  file: string,
  roverFirstGpsS: number | null,
  warn: (w: Warning) => void,
): ResolvedReference {
  if (!header.approxPosition) {
    // A data problem (exit 1), not a wrong command line.
    throw new InputError(file, 0, `${file} has no APPROX POSITION XYZ header record, so --ref-coord header cannot take the reference coordinate from it; give it with --ref-coord X,Y,Z or LAT,LON,H`);
  }
  const epochGpsS = roverFirstGpsS ?? header.firstObsGpsS;
  const epochYear = choice.epochYear ?? (epochGpsS !== null ? Math.round(decimalYearFromGpsS(epochGpsS) * 100) / 100 : NaN);
  const frame: FrameEpoch = { name: choice.frameName ?? 'unstated', epochYear };
  const said: string[] = [];
  if (choice.frameName === undefined) said.push("frame 'unstated' (the file does not state it)");
  if (choice.epochYear === undefined) said.push(`epoch ${Number.isFinite(epochYear) ? epochYear.toFixed(2) : 'unknown'} (the observation epoch)`);
  const assumed = said.length ? `; assumed ${said.join(' and ')}` : '';
  const note = `reference coordinate taken from the APPROX POSITION XYZ header record of ${file}: header coordinates can be approximate${assumed}`;
  warn({ file, line: 0, code: 'reference-from-header', message: `reference coordinate taken from the header record APPROX POSITION XYZ: header coordinates can be approximate${assumed}` });
  return { position: { ecef: header.approxPosition, frame }, source: `header of ${file}`, note };
}

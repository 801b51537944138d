/**
 * How the user gave the reference coordinate, and its resolution to a framed ECEF coordinate of the
 * reference ground mark.
 */
import {
  GRS80, InputError, WGS84, decimalYearFromGpsS, degToRad, geodeticToEcef,
  type EcefM, type FrameEpoch, type FramedEcef, type ObsHeader, type Warning,
} from '@refdelta/core';
import { parseNumber, parseNumberList } from './parse-values.js';
import { UsageError } from './usage-error.js';

export type ReferenceChoice =
  | { readonly mode: 'xyz'; readonly ecef: EcefM; readonly frame: FrameEpoch }
  | { readonly mode: 'header'; readonly frameName?: string; readonly epochYear?: number }
  | { readonly mode: 'mark'; readonly markName: string; readonly marksFile: string; readonly frameName?: string; readonly epochYear?: number };

export interface ReferenceArgs {
  readonly refXyz?: unknown;
  readonly refLlh?: unknown;
  readonly refFromHeader?: unknown;
  readonly refMark?: unknown;
  readonly marks?: unknown;
  readonly refFrame?: unknown;
  readonly refEpoch?: unknown;
}

function frameNameOf(v: unknown): string | undefined {
  if (v === undefined || v === null) return undefined;
  const s = String(v).trim();
  if (s === '') throw new UsageError('--ref-frame expects a frame name such as ITRF2014, ETRF2000 or WGS84');
  return s;
}

function epochOf(v: unknown): number | undefined {
  if (v === undefined || v === null) return undefined;
  // Frames are realised from 1980 on (GPS era); a coordinate epoch outside 1980-2100 is a typing slip.
  return parseNumber('ref-epoch', v, 1980, 2100);
}

/** The one way the reference coordinate was given; a UsageError for none, several, or a missing frame. */
export function parseReferenceChoice(a: ReferenceArgs): ReferenceChoice {
  const given = [
    a.refXyz !== undefined && '--ref-xyz',
    a.refLlh !== undefined && '--ref-llh',
    a.refFromHeader === true && '--ref-from-header',
    a.refMark !== undefined && '--ref-mark',
  ].filter((x): x is string => typeof x === 'string');
  if (given.length === 0) {
    throw new UsageError('give the reference coordinate with one of --ref-xyz X,Y,Z, --ref-llh LAT,LON,H, --ref-from-header or --ref-mark NAME --marks FILE');
  }
  if (given.length > 1) throw new UsageError(`give the reference coordinate one way only, not ${given.join(' and ')}`);
  const frameName = frameNameOf(a.refFrame);
  const epochYear = epochOf(a.refEpoch);
  if (a.refXyz !== undefined || a.refLlh !== undefined) {
    if (frameName === undefined || epochYear === undefined) {
      throw new UsageError(`${given[0]} needs --ref-frame NAME and --ref-epoch YEAR (the coordinate's frame and epoch, e.g. --ref-frame ITRF2014 --ref-epoch 2018.76)`);
    }
    const frame: FrameEpoch = { name: frameName, epochYear };
    if (a.refXyz !== undefined) {
      const [x, y, z] = parseNumberList('ref-xyz', a.refXyz, 3, 'X,Y,Z in metres');
      const r = Math.hypot(x, y, z);
      // Between 6300 km and 6400 km from the geocentre: the Earth's surface +-30 km (WGS-84 a = 6378.137 km, b = 6356.752 km).
      if (r < 6.3e6 || r > 6.4e6) throw new UsageError(`--ref-xyz ${x},${y},${z} is ${(r / 1000).toFixed(1)} km from the Earth's centre: expected a point near the surface (ECEF metres)`);
      return { mode: 'xyz', ecef: { x, y, z }, frame };
    }
    const [lat, lon, h] = parseNumberList('ref-llh', a.refLlh, 3, 'LAT,LON,H in degrees and ellipsoidal metres');
    if (Math.abs(lat) > 90) throw new UsageError(`--ref-llh latitude must be within -90..90 degrees, got ${lat}`);
    if (lon < -180 || lon > 360) throw new UsageError(`--ref-llh longitude must be within -180..360 degrees, got ${lon}`);
    if (h < -1000 || h > 10000) throw new UsageError(`--ref-llh height must be an ellipsoidal height within -1000..10000 m, got ${h}`);
    // GRS80 for ITRF/ETRF-type frames, WGS-84 for WGS 84 labels: they differ by 0.1 mm in height (NIMA TR8350.2 3.2).
    const ell = /^wgs/i.test(frameName) ? WGS84 : GRS80;
    const ecef = geodeticToEcef({ latRad: degToRad(lat), lonRad: degToRad(lon), heightM: h }, ell);
    return { mode: 'xyz', ecef, frame };
  }
  if (a.refFromHeader === true) return { mode: 'header', frameName, epochYear };
  if (a.marks === undefined || String(a.marks).trim() === '') throw new UsageError('--ref-mark needs --marks FILE (the control list CSV that holds the mark)');
  return { mode: 'mark', markName: String(a.refMark), marksFile: String(a.marks), frameName, epochYear };
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
    throw new InputError(file, 0, `${file} has no APPROX POSITION XYZ header record, so --ref-from-header cannot take the reference coordinate from it; give it with --ref-xyz or --ref-llh`);
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

/**
 * GeoJSON (RFC 7946) of the epoch positions: a FeatureCollection of Point features.
 * RFC 7946 section 4 fixes the coordinate reference system to WGS 84 longitude, latitude (degrees) and
 * ellipsoidal height (m). Our positions are in the frame of the reference coordinate, which may not be
 * WGS 84: the actual frame is stated in a foreign member "refdelta" (RFC 7946 section 6.1) and in every
 * feature's properties, with a note, never silently.
 */
import type { FrameEpoch } from '../gnss/index.js';
import { gpsToUtcS, isoFromSeconds, weekTowFromGpsS } from '../time/index.js';
import { crsOfFrame } from '../frames/index.js';
import { radToDeg } from '../geodesy/index.js';
import type { EpochSolution, PointReference } from '../session/index.js';
import { frameEpochText, jsonNumber } from './format.js';
import { pointReferenceWords } from './point-reference.js';

export interface GeoJsonOptions {
  readonly frame: FrameEpoch;
  readonly pointReference: PointReference;
  /** Include epochs of kind 'standalone' (default true). Epochs without a position are never included. */
  readonly includeStandalone?: boolean;
}

export interface PointFeature {
  readonly type: 'Feature';
  readonly geometry: { readonly type: 'Point'; readonly coordinates: readonly [number, number, number] };
  readonly properties: Readonly<Record<string, string | number | null>>;
}

export interface RefdeltaFeatureCollection {
  readonly type: 'FeatureCollection';
  readonly refdelta: {
    readonly frame: string;
    readonly frame_epoch: number | null;
    readonly point_reference: string;
    readonly note: string;
  };
  readonly features: readonly PointFeature[];
}

/** True when the frame label names WGS 84 (any realisation), for which RFC 7946's assumption holds. */
export function isWgs84Label(name: string): boolean {
  return /^wgs[\s_-]*84/i.test(name.trim());
}

export function geojsonNote(frame: FrameEpoch): string {
  if (!crsOfFrame(frame.name)) {
    return `RFC 7946 assumes WGS 84 coordinates, but these positions are in the frame '${frame.name}' at epoch ${frameEpochText(frame.epochYear)}, ` +
      'which refdelta cannot map to a CRS: do not take them as WGS 84 (the offset can reach metres or, for a wrong reference, more).';
  }
  const base = 'RFC 7946 assumes WGS 84 coordinates (longitude, latitude in degrees, ellipsoidal height in metres).';
  return isWgs84Label(frame.name)
    ? `${base} These positions are in ${frame.name} at epoch ${frameEpochText(frame.epochYear)}.`
    : `${base} These positions are NOT transformed to WGS 84: they are in ${frame.name} at epoch ` +
      `${frameEpochText(frame.epochYear)}, the frame of the reference coordinate (ITRF-type frames agree with ` +
      `recent WGS 84 to about a metre or better; regional frames such as ETRS89 or NAD83 differ by up to a few metres).`;
}

/** One epoch as a Point feature, or null when it has no position. */
export function epochFeature(s: EpochSolution, frame: FrameEpoch, pointName: string = s.pointName): PointFeature | null {
  const g = s.geodetic;
  if (!g || s.kind === 'none') return null;
  return {
    type: 'Feature',
    geometry: {
      type: 'Point',
      // RFC 7946 section 3.1.1: [longitude, latitude, altitude]; 1e-9 deg ~ 0.1 mm (section 11.2 advises no excess; we keep sub-mm).
      coordinates: [jsonNumber(radToDeg(g.lonRad), 9)!, jsonNumber(radToDeg(g.latRad), 9)!, jsonNumber(g.heightM, 4)!],
    },
    properties: {
      // Names and meanings as in epochs.csv (report/vocabulary.ts).
      gps_week: weekTowFromGpsS(s.timeGpsS).week,
      gps_tow_s: jsonNumber(weekTowFromGpsS(s.timeGpsS).towS, 3),
      utc_time: isoFromSeconds(gpsToUtcS(s.timeGpsS), 'Z'),
      point: pointName,
      solution: s.kind,
      frame: frame.name,
      frame_epoch: jsonNumber(frame.epochYear, 4),
      point_reference: pointReferenceWords(s.pointReference),
      sigma_east_m: jsonNumber(s.sigmaEnuM?.e, 4),
      sigma_north_m: jsonNumber(s.sigmaEnuM?.n, 4),
      sigma_up_m: jsonNumber(s.sigmaEnuM?.u, 4),
      pdop: jsonNumber(s.dops?.pdop, 2),
      satellites_used: s.satellitesUsed,
      correction_age_s: jsonNumber(s.correctionAgeS, 3),
      speed_m_s: jsonNumber(s.speedMS, 3),
    },
  };
}

export function geojson(solutions: Iterable<EpochSolution>, opts: GeoJsonOptions): RefdeltaFeatureCollection {
  const features: PointFeature[] = [];
  for (const s of solutions) {
    if (s.kind === 'standalone' && opts.includeStandalone === false) continue;
    const f = epochFeature(s, opts.frame);
    if (f) features.push(f);
  }
  return {
    type: 'FeatureCollection',
    refdelta: {
      frame: opts.frame.name,
      frame_epoch: jsonNumber(opts.frame.epochYear, 4),
      point_reference: pointReferenceWords(opts.pointReference),
      note: geojsonNote(opts.frame),
    },
    features,
  };
}

/**
 * The EPSG coordinate reference systems of the frames we know by name: geographic 2-D (latitude,
 * longitude: what a .prj or a GeoPackage layer of 2-D points states), geographic 3-D (with ellipsoidal
 * height) and geocentric (ECEF). Codes from the EPSG Geodetic Parameter Dataset as distributed in the
 * npm package epsg-index 2.0.0 (frame-crs.test.ts reads each code back there and checks its name and
 * kind). A frame not in this list (or 'unstated') has no CRS: outputs leave it unlabelled and warn.
 */
import { normaliseFrameName, UNSTATED_FRAME } from './frame-names.js';

export interface FrameCrs {
  /** The frame's canonical name (frame-names.ts). */
  readonly frame: string;
  /** The EPSG name of the CRS ('WGS 84', 'ITRF2014'...). */
  readonly epsgName: string;
  readonly geographic2d: number;
  readonly geographic3d: number | null;
  readonly geocentric: number | null;
}

type Row = readonly [frame: string, epsgName: string, geographic2d: number, geographic3d: number | null, geocentric: number | null];

// [canonical frame, EPSG name, geographic 2D, geographic 3D, geocentric]
const ROWS: readonly Row[] = [
  ['WGS84', 'WGS 84', 4326, 4979, 4978],
  ['ETRS89', 'ETRS89', 4258, 4937, 4936],
  ['ITRF88', 'ITRF88', 8988, 7900, 4910],
  ['ITRF89', 'ITRF89', 8989, 7901, 4911],
  ['ITRF90', 'ITRF90', 8990, 7902, 4912],
  ['ITRF91', 'ITRF91', 8991, 7903, 4913],
  ['ITRF92', 'ITRF92', 8992, 7904, 4914],
  ['ITRF93', 'ITRF93', 8993, 7905, 4915],
  ['ITRF94', 'ITRF94', 8994, 7906, 4916],
  ['ITRF96', 'ITRF96', 8995, 7907, 4917],
  ['ITRF97', 'ITRF97', 8996, 7908, 4918],
  ['ITRF2000', 'ITRF2000', 8997, 7909, 4919],
  ['ITRF2005', 'ITRF2005', 8998, 7910, 4896],
  ['ITRF2008', 'ITRF2008', 8999, 7911, 5332],
  ['ITRF2014', 'ITRF2014', 9000, 7912, 7789],
  ['ITRF2020', 'ITRF2020', 9990, 9989, 9988],
  ['ETRF89', 'ETRF89', 9059, 7915, 7914],
  ['ETRF90', 'ETRF90', 9060, 7917, 7916],
  ['ETRF91', 'ETRF91', 9061, 7919, 7918],
  ['ETRF92', 'ETRF92', 9062, 7921, 7920],
  ['ETRF93', 'ETRF93', 9063, 7923, 7922],
  ['ETRF94', 'ETRF94', 9064, 7925, 7924],
  ['ETRF96', 'ETRF96', 9065, 7927, 7926],
  ['ETRF97', 'ETRF97', 9066, 7929, 7928],
  ['ETRF2000', 'ETRF2000', 9067, 7931, 7930],
  ['ETRF2005', 'ETRF2005', 9068, 8399, 8397],
  ['ETRF2014', 'ETRF2014', 9069, 8403, 8401],
  ['NAD83', 'NAD83', 4269, null, null],
  ['NAD83(2011)', 'NAD83(2011)', 6318, 6319, 6317],
  ['NAD83(CSRS)', 'NAD83(CSRS)', 4617, 4955, 4954],
  ['GDA94', 'GDA94', 4283, 4939, 4938],
  ['GDA2020', 'GDA2020', 7844, 7843, 7842],
];

const BY_FRAME = new Map<string, FrameCrs>(ROWS.map(([frame, epsgName, geographic2d, geographic3d, geocentric]) => [frame, { frame, epsgName, geographic2d, geographic3d, geocentric }]));

/** Every frame name the engine knows (canonical forms), 'unstated' excluded. */
export const KNOWN_FRAME_NAMES: readonly string[] = ROWS.map((r) => r[0]);

/**
 * The CRS of a frame label, or null for 'unstated' and unknown names. The label 'WGS84 (broadcast
 * orbits)' of standalone positions maps to WGS 84: the broadcast orbits are WGS 84 (their ICDs).
 */
export function crsOfFrame(name: string): FrameCrs | null {
  const bare = name.replace(/\s*\(broadcast orbits\)\s*$/i, '');
  const n = normaliseFrameName(bare);
  if (n === UNSTATED_FRAME) return null;
  return BY_FRAME.get(n) ?? null;
}

/** True when the name is one of KNOWN_FRAME_NAMES (after normalisation) or 'unstated'. */
export function isKnownFrameName(name: string): boolean {
  const n = normaliseFrameName(name.replace(/\s*\(broadcast orbits\)\s*$/i, ''));
  return n === UNSTATED_FRAME || BY_FRAME.has(n);
}

/** The frame whose geographic 2-D EPSG CRS has this code, or null (e.g. a national datum not in the list). */
export function frameOfGeographicEpsg(code: number): FrameCrs | null {
  for (const c of BY_FRAME.values()) if (c.geographic2d === code) return c;
  return null;
}

/**
 * A point matched to a mark by name but far from it. What can separate a point from its own mark: the
 * point's error (code differential about 1 m, standalone under 10 m at 95 %: check-values.md "Accuracy
 * facts"), frame differences (ITRF/WGS 84 against ETRS89 about 0.7 m in Europe in 2018) and datum
 * differences of classical national datums against WGS 84 (tens to a few hundred metres, e.g. about
 * 100 m for OSGB36 in Great Britain: from memory). Beyond 1 km none of these applies: the mark's
 * coordinates are not in the CRS the file says (another UTM zone moves them by hundreds of km, swapped
 * easting and northing or latitude and longitude by thousands), or the names pair different places.
 */

/** Horizontal distance (m) beyond which a match by name cannot be a measurement, frame or datum difference (see above). */
export const FAR_NAME_MATCH_M = 1000;

export interface NamedPair {
  readonly session?: string | null;
  readonly pointName: string;
  readonly markName: string;
  readonly by: 'name' | 'proximity';
  readonly horizontalM: number;
}

/** One warning sentence for the pairs matched by name more than FAR_NAME_MATCH_M apart, or null. */
export function farNameMatchSentence(pairs: readonly NamedPair[], marksFile: string): string | null {
  const far = pairs.filter((p) => p.by === 'name' && p.horizontalM > FAR_NAME_MATCH_M);
  if (far.length === 0) return null;
  const listed = far.slice(0, 5).map((p) => `${p.session ? `${p.session}/` : ''}${p.pointName} is ${(p.horizontalM / 1000).toFixed(p.horizontalM < 1e5 ? 2 : 0)} km from mark ${p.markName}`);
  return `${far.length} point(s) matched by name lie more than ${FAR_NAME_MATCH_M / 1000} km from their mark (${listed.join(', ')}${far.length > 5 ? ', ...' : ''}): ` +
    `far more than a measurement, frame or datum difference explains. Check the CRS of ${marksFile}: its projection code, UTM zone and hemisphere, ` +
    'and the order of its coordinates (easting before northing, latitude before longitude); or the names pair different places';
}

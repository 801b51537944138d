/**
 * Is the reference coordinate given (--ref-coord X,Y,Z / LAT,LON,H or a mark) where the reference
 * receiver is? A wrong coordinate moves every differential position by the same amount and cannot be
 * seen in the results (summary cautions), so it is compared, before the run, with what the reference file
 * says about itself: its APPROX POSITION XYZ and, when that is missing or disagrees, its own
 * single-receiver (standalone) position from its first epochs.
 */
import {
  ProcessingError, solveStandaloneSession,
  type EcefM, type NavData, type ObsHeader, type SessionOptions, type Warning,
} from '@refdelta/core';
import { openObs } from './node-io.js';

/**
 * Farther than this from the header position (or from the station's own standalone position), the
 * coordinate is flagged. Header positions are usually a receiver's standalone fix (RINEX 3.04 calls the
 * record approximate): GPS SPS accuracy is 9 m horizontal / 15 m vertical at 95 % on the global
 * average and 17 m / 37 m at the worst site (GPS SPS Performance Standard, 4th edition 2008; figures from memory), and
 * a header written from a receiver's first fix is at most some tens of metres off (common practice).
 * 100 m is beyond that with a margin, and well below a neighbouring station's coordinate given by mistake.
 */
export const REFERENCE_HEADER_TOLERANCE_M = 100;

/**
 * Farther than this from where the station's own standalone position puts it, the coordinate cannot be
 * the station's: a standalone fix is good to tens of metres, not kilometres. Such a coordinate (latitude
 * and longitude swapped, a lost sign, another station's coordinate) would move every position by as much,
 * so the run stops. 10 km rather than nearer: the stop must be certain even where the standalone
 * position is itself poor (few satellites, old ephemerides: hundreds of metres), so that its sentence may
 * say the coordinate cannot be the station's; between 100 m and 10 km the warning gives both distances and
 * the run goes on. A header alone does not stop a run: it may be a stale one from an earlier site.
 */
export const REFERENCE_ABSURD_DISTANCE_M = 10_000;

/** Standalone epochs whose median is the station's own position (a few are enough at these thresholds). */
const STANDALONE_EPOCHS = 20;

/** ECEF metres 6300-6400 km from the geocentre: a header position on the Earth's surface (zero and blank are none). */
export function usableHeaderPosition(p: EcefM | null): EcefM | null {
  if (!p) return null;
  const r = Math.hypot(p.x, p.y, p.z);
  return r >= 6.3e6 && r <= 6.4e6 ? p : null;
}

function distanceM(a: EcefM, b: EcefM): number {
  return Math.hypot(a.x - b.x, a.y - b.y, a.z - b.z);
}

function median(v: number[]): number {
  const s = [...v].sort((a, b) => a - b);
  const m = s.length >> 1;
  return s.length % 2 ? s[m]! : (s[m - 1]! + s[m]!) / 2;
}

/** A distance for a sentence: metres below 10 km, else kilometres. */
export function distanceWords(m: number): string {
  return m < 10_000 ? `${m.toFixed(0)} m` : `${(m / 1000).toFixed(0)} km`;
}

/** The station's own standalone position: the median of its first standalone fixes; null when none is found. */
export async function standalonePositionOf(
  file: string, header: ObsHeader, nav: NavData, options: Omit<SessionOptions, 'reference' | 'roverAntenna'>,
): Promise<{ ecef: EcefM; epochs: number } | null> {
  try {
    const obs = await openObs(file, () => {}, options.systems);
    const run = solveStandaloneSession({ rover: obs, nav, onWarning: () => {} }, { ...options, roverAntenna: header.antennaOffset });
    const xs: number[] = [], ys: number[] = [], zs: number[] = [];
    for await (const s of run.epochs) {
      if (s.position) {
        xs.push(s.position.ecef.x);
        ys.push(s.position.ecef.y);
        zs.push(s.position.ecef.z);
      }
      if (xs.length >= STANDALONE_EPOCHS) break;
    }
    return xs.length ? { ecef: { x: median(xs), y: median(ys), z: median(zs) }, epochs: xs.length } : null;
  } catch {
    // No standalone position (no usable epoch or ephemeris): the header alone is compared.
    return null;
  }
}

export interface ReferencePositionCheck {
  /** The reference station's observation file (the CORS's with --tie-to). */
  readonly file: string;
  readonly header: ObsHeader;
  /** The coordinate given. */
  readonly given: EcefM;
  /** Words for the coordinate in sentences, e.g. '--ref-coord' or 'mark KFRD'. */
  readonly givenWords: string;
  readonly nav: NavData;
  readonly options: Omit<SessionOptions, 'reference' | 'roverAntenna'>;
  readonly warn: (w: Warning) => void;
}

/**
 * Compares the given coordinate with the header position and, when the header is missing or more than
 * REFERENCE_HEADER_TOLERANCE_M away, with the station's own standalone position (which then decides).
 * A warning beyond the tolerance; a ProcessingError beyond REFERENCE_ABSURD_DISTANCE_M from the standalone position.
 */
export async function checkReferencePosition(c: ReferencePositionCheck): Promise<void> {
  const header = usableHeaderPosition(c.header.approxPosition);
  const fromHeaderM = header ? distanceM(c.given, header) : null;
  if (fromHeaderM !== null && fromHeaderM <= REFERENCE_HEADER_TOLERANCE_M) return;
  const own = await standalonePositionOf(c.file, c.header, c.nav, c.options);
  const fromOwnM = own ? distanceM(c.given, own.ecef) : null;
  // The station's own position decides when there is one: a header far from a coordinate the data confirm is a stale header.
  const decidingM = fromOwnM ?? fromHeaderM;
  if (decidingM === null) return;
  const measures = [
    ...(fromHeaderM === null ? [] : [`${distanceWords(fromHeaderM)} from its APPROX POSITION XYZ`]),
    ...(own && fromOwnM !== null ? [`${distanceWords(fromOwnM)} from its own single-receiver position, the median of its first ${own.epochs} fixes`] : []),
  ].join('; ');
  if (fromOwnM !== null && fromOwnM > REFERENCE_ABSURD_DISTANCE_M) {
    throw new ProcessingError(
      `the reference coordinate (${c.givenWords}) is ${distanceWords(fromOwnM)} from the station observed in ${c.file} (${measures}), so it cannot be that station's coordinate ` +
      '(latitude and longitude swapped? a lost sign? another station?): every position would be off by as much; give the coordinate of the station observed in the reference file',
    );
  }
  if (decidingM <= REFERENCE_HEADER_TOLERANCE_M) return;
  c.warn({
    file: c.file, line: 0, code: 'reference-coordinate-far',
    message: `the reference coordinate (${c.givenWords}) is ${distanceWords(decidingM)} from the station observed in this file (${measures}), ` +
      `farther than the ${REFERENCE_HEADER_TOLERANCE_M} m header positions are usually off: if it is not this station's coordinate (or not in its frame), every position is shifted by the difference`,
  });
}

/** Checks made before processing: time overlap of the files, navigation data for the systems observed. */
import {
  ProcessingError, SYSTEM_NAMES, satSystem, ephemerisTimeGpsS, gpsToUtcS, isoFromSeconds,
  type GnssSystem, type NavData, type ObsHeader, type ObsStream, type WarningSink,
} from '@refdelta/core';
import { openObs } from './node-io.js';
import { EpochsRead } from './epochs-read.js';

export interface TimeSpan {
  readonly firstGpsS: number;
  readonly lastGpsS: number;
}

/** The span of an observation file: from its header when both TIME OF FIRST/LAST OBS are there, else by reading its epochs. */
export async function obsTimeSpan(path: string, header: ObsHeader, onWarning: WarningSink = () => {}): Promise<TimeSpan | null> {
  // Header times are trusted only when they make a span (a damaged TIME OF LAST OBS can precede the first).
  if (header.firstObsGpsS !== null && header.lastObsGpsS !== null && header.lastObsGpsS >= header.firstObsGpsS) {
    return { firstGpsS: header.firstObsGpsS, lastGpsS: header.lastObsGpsS };
  }
  const s = await openObs(path, onWarning);
  const read = new EpochsRead();
  for await (const ep of s.epochs) read.note(ep);
  return Number.isFinite(read.firstGpsS) ? { firstGpsS: read.firstGpsS, lastGpsS: read.lastGpsS } : null;
}

/**
 * The systems whose satellites appear in the file's epochs (a header may list codes of a system never
 * tracked), as far as `asked` is concerned: reading stops once every system of `asked` is seen (usually
 * in the first epoch), so the set may lack systems outside `asked`; a system of `asked` never tracked
 * makes it read the whole file. `s` is a stream of the file not read yet (a header probe's: the file is
 * not opened again).
 */
export async function systemsSeen(s: ObsStream, asked: readonly GnssSystem[]): Promise<Set<GnssSystem>> {
  const seen = new Set<GnssSystem>();
  const allSeen = () => asked.every((x) => seen.has(x));
  if (asked.length === 0) return seen;
  for await (const ep of s.epochs) {
    for (const o of ep.sats) seen.add(satSystem(o.sat));
    if (allSeen()) break;
  }
  return seen;
}

/** A GPS time as UTC to the second for messages: '2018-10-04 12:37:50 UTC'. */
export function utcSecondText(gpsS: number): string {
  return `${isoFromSeconds(gpsToUtcS(gpsS), '').replace('T', ' ').slice(0, 19)} UTC`;
}

/** What the two sides of an overlap check are called in its sentence. */
export interface OverlapRoles {
  /** The file whose span must be covered, e.g. 'rover'. */
  readonly rover: string;
  /** The files that must cover it, e.g. 'reference'. */
  readonly reference: string;
  /** What to do about it, appended to the sentence (may be empty). */
  readonly advice: string;
}

export const ROVER_REFERENCE_ROLES: OverlapRoles = { rover: 'rover', reference: 'reference', advice: '' };

/** A base tied to a CORS (--tie-to): the base's file is the one covered, the CORS files cover it. */
export const BASE_CORS_ROLES: OverlapRoles = {
  rover: 'base', reference: 'CORS',
  advice: ': the base is tied to the CORS over their common time; give the CORS file(s) of the base\'s session with --tie-to',
};

/**
 * The reference files together must overlap the rover's span (spans in continuous GPS seconds, so a
 * session across midnight is fine).
 */
export function requireOverlap(rover: { path: string; span: TimeSpan }, references: readonly { path: string; span: TimeSpan }[], roles: OverlapRoles = ROVER_REFERENCE_ROLES): void {
  const r = rover.span;
  const overlapping = references.filter((x) => x.span.firstGpsS <= r.lastGpsS && x.span.lastGpsS >= r.firstGpsS);
  if (overlapping.length === 0) {
    const refs = references.map((x) => `${x.path} (${utcSecondText(x.span.firstGpsS)} to ${utcSecondText(x.span.lastGpsS)})`).join(', ');
    throw new ProcessingError(`the files do not overlap in time: ${roles.rover} ${rover.path} runs ${utcSecondText(r.firstGpsS)} to ${utcSecondText(r.lastGpsS)}, ${roles.reference} ${refs}${roles.advice}`);
  }
}

/** Broadcast records are used up to a few hours from their reference time (GPS: fit interval 4 h, IS-GPS-200 20.3.4.4). */
export const NAV_WINDOW_S = 4 * 3600;

/**
 * There must be ephemerides, near the rover's span, for at least one of the systems the rover observed
 * and the user allowed. Systems without any are reported as warnings.
 */
export function requireNavigation(nav: NavData, navPaths: readonly string[], roverHeader: ObsHeader, systems: readonly GnssSystem[], span: TimeSpan | null, warn: WarningSink, seen?: ReadonlySet<GnssSystem>): GnssSystem[] {
  // Systems the header lists codes for and, when known, whose satellites are actually in the data.
  const observed = (Object.keys(roverHeader.obsCodes) as GnssSystem[]).filter((s) => systems.includes(s) && (roverHeader.obsCodes[s]?.length ?? 0) > 0 && (!seen || seen.has(s)));
  const covered = new Set<GnssSystem>();
  for (const e of nav.ephemerides) {
    const t = ephemerisTimeGpsS(e);
    if (span && (t < span.firstGpsS - NAV_WINDOW_S || t > span.lastGpsS + NAV_WINDOW_S)) continue;
    covered.add(e.system);
  }
  const usable = observed.filter((s) => covered.has(s));
  if (usable.length === 0) {
    const obsNames = observed.map((s) => SYSTEM_NAMES[s]).join(', ') || 'no allowed system';
    const spanText = span ? ` between ${utcSecondText(span.firstGpsS - NAV_WINDOW_S)} and ${utcSecondText(span.lastGpsS + NAV_WINDOW_S)}` : '';
    throw new ProcessingError(`no navigation data for the satellites observed: the rover observed ${obsNames}, but ${navPaths.join(', ')} ${navPaths.length > 1 ? 'hold' : 'holds'} no ephemeris for ${observed.length > 1 ? 'these systems' : 'it'}${spanText}`);
  }
  for (const s of observed) {
    if (!covered.has(s)) {
      warn({ code: 'no-navigation-for-system', message: `no ${SYSTEM_NAMES[s]} ephemeris in the navigation files for the rover's time span: ${SYSTEM_NAMES[s]} satellites are not used` });
    }
  }
  return usable;
}

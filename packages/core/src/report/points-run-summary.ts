/**
 * What a points run adds to its summary.json: the options of the points stage (projection, geoid,
 * windows, tolerances, as batch-summary.json echoes them), the CRS of the grid coordinates and the
 * height reference in words, and the scatter of the epochs about their own point's mean.
 *
 * The scatter of every epoch about the session's overall mean means nothing for a session with
 * several points: the rover walked between them, and the figure is the size of the walk. Each epoch is
 * taken about the mean of its own occupation instead (the epochs the point averages, chooseEpochs),
 * and the figures are pooled over the points; epochs between occupations are left out.
 */
import type { GeoidModel } from '../geoid/index.js';
import type { FrameEpoch } from '../gnss/index.js';
import { enuDifferences, horizontalVerticalStats, meanEcef, type ScatterStats } from './statistics.js';
import { chooseEpochs, OCCUPATION_TAG_TOLERANCE_S, type PointEpoch, type PointResult } from './points-summary.js';
import { EGM96_NOT_A_DATUM_NOTE, gridLabel, type GridLabel, type PointsTableOptions } from './points-table.js';
import { frameWords } from './point-reference.js';
import type { LabelledScatter } from './summary-json.js';

/** The datum part of a grid CRS name ('WGS 84 / Irish Transverse Mercator parameters' -> 'WGS 84'); null when the name has none. */
function datumOfGridName(name: string): string | null {
  const i = name.indexOf(' / ');
  if (i <= 0 || name.startsWith('+')) return null;
  const d = name.slice(0, i).trim();
  return d.toLowerCase() === 'unknown datum' ? 'an unknown datum' : d;
}

/**
 * The grid CRS in words: its name with the EPSG code when it is an EPSG CRS, else
 * 'custom: <parameters> on <datum>' (the projection's parameters on the datum the coordinates are on).
 */
export function gridCrsWords(g: Pick<GridLabel, 'epsg' | 'name' | 'definition'>): string {
  if (g.epsg !== null) return g.name.includes(`EPSG:${g.epsg}`) ? g.name : `${g.name} (EPSG:${g.epsg})`;
  const datum = datumOfGridName(g.name);
  return datum
    ? `custom: ${g.definition} on ${datum} (${g.name}; no EPSG code)`
    : `custom: ${g.definition} (a PROJ string as given; its datum is not checked; no EPSG code)`;
}

/** The heights of the points in words, and the geoid model's caution when it has one. */
export interface HeightsStatement {
  /**
   * The frame's name, not its epoch: e.g. 'ellipsoidal (height_m, above the ellipsoid of WGS84); orthometric
   * (orthometric_height_m = height_m - N) above EGM96 geoid (EGM96 (NGA 15-minute grid, bilinear))', or
   * 'ellipsoidal (height_m, above the ellipsoid of WGS84) only (no geoid model given)'.
   */
  readonly label: string;
  readonly ellipsoidal: string;
  /** null without a geoid. */
  readonly orthometric: string | null;
  /** The geoid module's caution (EGM96 is not a national height datum), null when it gives none. */
  readonly caution: string | null;
}

export function heightsStatement(frame: FrameEpoch, geoid?: GeoidModel): HeightsStatement {
  const ellipsoidal = `ellipsoidal (height_m, above the ellipsoid of ${frame.name.toLowerCase() === 'unstated' ? "the points' frame, which is not stated" : frame.name})`;
  const orthometric = geoid ? `orthometric (orthometric_height_m = height_m - N) above ${geoid.heightReference} (${geoid.name})` : null;
  const caution = geoid && /egm96/i.test(geoid.name + geoid.heightReference) ? EGM96_NOT_A_DATUM_NOTE : null;
  return { label: orthometric ? `${ellipsoidal}; ${orthometric}` : `${ellipsoidal} only (no geoid model given)`, ellipsoidal, orthometric, caution };
}

/**
 * Scatter of each point's epochs (those it averages) about the mean of those epochs, pooled over the
 * points. mean_ecef is null: there is no one mean. NaN figures when no point has an epoch. Needs of an
 * epoch its tag, kind and position only, so a report can compute it again from epochs.csv.
 */
export function pooledPointScatter(
  epochs: readonly Pick<PointEpoch, 'tagGpsS' | 'kind' | 'ecef'>[], points: readonly Pick<PointResult, 'startGpsS' | 'endGpsS'>[], minEpochs = 10,
): ScatterStats & { readonly points: number } {
  const diffs = [];
  let used = 0;
  for (const p of points) {
    const inside = epochs.filter((e) => e.tagGpsS >= p.startGpsS - OCCUPATION_TAG_TOLERANCE_S && e.tagGpsS <= p.endGpsS + OCCUPATION_TAG_TOLERANCE_S);
    const positions = chooseEpochs(inside, minEpochs).chosen.map((e) => e.ecef);
    const m = meanEcef(positions);
    if (!m) continue;
    used++;
    for (const d of enuDifferences(positions, m)) diffs.push(d);
  }
  return { ...horizontalVerticalStats(diffs), meanEcef: null, points: used };
}

/** summary.json's statistics.kind of the pooled scatter about each point's own mean. */
export const POOLED_POINT_SCATTER_KIND = 'each-point-mean';

/** The labelled scatter of a points run for summary.json's `statistics`. */
export function pointsRunScatter(epochs: readonly PointEpoch[], points: readonly PointResult[]): LabelledScatter {
  const stats = pooledPointScatter(epochs, points);
  return {
    kind: POOLED_POINT_SCATTER_KIND,
    over: `the epochs of ${stats.points} point(s), each about its own point's mean (epochs between points left out)`,
    about: "scatter of each point's epochs about that point's mean, pooled over the points (precision, not accuracy)",
    stats,
  };
}

/** What the points stage was given, for summary.json's options. */
export interface PointsRunOptions {
  readonly projectionSpec?: string;
  readonly geoidSpec?: string;
  readonly windowsFile?: string;
  readonly toleranceHM: number;
  readonly toleranceVM: number;
}

/**
 * summary.json of a points run: the solve run's document with the points stage's options, the grid CRS
 * (`grid_crs`, null without a projection), the heights and the pooled point scatter.
 */
export function withPointsRun(
  doc: Record<string, unknown>, o: PointsRunOptions, table: Pick<PointsTableOptions, 'frame' | 'projection' | 'grid' | 'geoid'>, scatterJson: Record<string, unknown> | null,
): Record<string, unknown> {
  const grid = gridLabel(table);
  return {
    ...doc,
    options: {
      ...(doc.options as Record<string, unknown>),
      projection: o.projectionSpec ?? null, geoid: o.geoidSpec ?? null, windows: o.windowsFile ?? null,
      tolerance_h_m: o.toleranceHM, tolerance_v_m: o.toleranceVM,
    },
    grid_crs: grid ? { label: gridCrsWords(grid), epsg: grid.epsg, name: grid.name, definition: grid.definition, datum: grid.datum ?? null, frame: frameWords(table.frame) } : null,
    heights: heightsStatement(table.frame, table.geoid),
    ...(scatterJson ? { statistics: scatterJson } : {}),
  };
}

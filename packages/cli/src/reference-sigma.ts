/**
 * How well the reference coordinate itself is known (1 sigma per horizontal axis, and vertical): it moves
 * every point alike, so a point's stated precision in the frame includes it (points.csv radius95_m).
 * Given as `--ref-sigma H[,V]` (metres); defaults by where the coordinate came from:
 * - a file header's APPROX POSITION XYZ: 2 m horizontal, 3 m vertical. Headers often hold a receiver's own
 *   standalone estimate (SPS Performance Standard: <= 9 m horizontal / 15 m vertical 95 % for one epoch;
 *   an average over a session is usually a few metres): a cautious middle, from memory.
 * - a coordinate given on the command line or taken from a control list: 0.02 m horizontal, 0.03 m
 *   vertical (published CORS and control-mark coordinates are centimetre-level: common practice).
 */
import type { ReferenceSigma } from '@refdelta/core';
import { UsageError } from './usage-error.js';

export const HEADER_REFERENCE_SIGMA: ReferenceSigma = { horizontalM: 2, verticalM: 3 };
export const PUBLISHED_REFERENCE_SIGMA: ReferenceSigma = { horizontalM: 0.02, verticalM: 0.03 };

export function referenceSigmaOf(fromHeader: boolean, option: unknown): ReferenceSigma & { readonly source: string } {
  if (option === undefined || option === null || option === '') {
    return fromHeader ? { ...HEADER_REFERENCE_SIGMA, source: 'default for a header coordinate' } : { ...PUBLISHED_REFERENCE_SIGMA, source: 'default for a given or published coordinate' };
  }
  const parts = String(option).split(',').map((x) => x.trim());
  const v = parts.map(Number);
  if (parts.length < 1 || parts.length > 2 || v.some((x) => !Number.isFinite(x) || x < 0)) {
    throw new UsageError(`--ref-sigma: expected H or H,V in metres (the reference coordinate's 1-sigma uncertainty, horizontal per axis and vertical), e.g. 0.02,0.03; got '${String(option)}'`);
  }
  return { horizontalM: v[0], verticalM: v[1] ?? v[0], source: '--ref-sigma' };
}

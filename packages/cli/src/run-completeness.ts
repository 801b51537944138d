/**
 * How complete a run is, in words for its summary lines, summary.json and a batch's session status:
 * observations lost while reading the inputs (a file cut off mid-record, a damaged compressed stream),
 * and rover epochs left without a solution, with their main reason and the share of the rover's span
 * the reference files cover.
 */
import { formatWarning, type ObsHeader, type RejectionCount, type SessionSummary, type Warning, type WarningSink } from '@refdelta/core';
import { utcSecondText, type TimeSpan } from './input-checks.js';
import type { WarningTally } from './reporter.js';

/**
 * Reader warning codes that mean observations of a file were lost: an epoch skipped (cut off or
 * damaged), a compact RINEX or compressed stream damaged or truncated, a rover or reference file's
 * epochs ending before its header's TIME OF LAST OBS (ENDS_EARLY_CODES).
 */
export const ROVER_ENDS_EARLY_CODE = 'rover-ends-early';
export const REFERENCE_ENDS_EARLY_CODE = 'reference-ends-early';
export type FileRole = 'rover' | 'reference';
const ENDS_EARLY_CODES: Readonly<Record<FileRole, string>> = { rover: ROVER_ENDS_EARLY_CODE, reference: REFERENCE_ENDS_EARLY_CODE };
export const DATA_LOST_CODES: ReadonlySet<string> = new Set([
  'bad-epoch-skipped', 'crx-truncated', 'crx-damaged', 'crx-unrecovered', 'gzip-damaged', 'unix-compress-damaged', ROVER_ENDS_EARLY_CODE, REFERENCE_ENDS_EARLY_CODE,
]);

/**
 * A share of rover epochs without a solution above which the run warns (our choice: a fifth of the
 * session, well above what a session normally loses at its ends and in short outages: 0.4 % of the DGAR
 * day, none of the static run).
 */
export const UNSOLVED_WARNING_SHARE = 0.2;

/** Below this share of the rover's span covered by the reference files, the summary names the coverage. */
const FULL_COVERAGE = 0.995;


/** Observations lost while reading: how many reader warnings say so and the first of them; null when none. */
export interface DataLost {
  readonly count: number;
  readonly first: Warning | null;
  readonly sentence: string;
}

/** From a run's warnings (the kept ones for the first; the tally counts all). */
export function dataLost(warnings: readonly Warning[], tally: WarningTally): DataLost | null {
  let count = 0;
  for (const code of DATA_LOST_CODES) count += tally.byCode[code] ?? 0;
  if (count === 0) return null;
  const first = warnings.find((w) => DATA_LOST_CODES.has(w.code)) ?? null;
  const sentence = `observations were lost while reading${first ? `: ${formatWarning(first)}` : ''}${count > 1 ? ` (${count} such problems)` : ''}`;
  return { count, first, sentence };
}

/**
 * A file's epochs end well before its header's TIME OF LAST OBS: the file was cut off (at a record
 * boundary no reader warning says so). More than two intervals (or 2 s without INTERVAL) is a gap, not
 * rounding. `role` names the file in the sentence and the warning's code.
 */
export function fileEndsEarly(role: FileRole, file: string, headerLastGpsS: number | null, intervalS: number | null, lastEpochGpsS: number): Warning | null {
  if (headerLastGpsS === null || !Number.isFinite(lastEpochGpsS)) return null;
  const gapS = headerLastGpsS - lastEpochGpsS;
  if (gapS <= Math.max(2 * (intervalS ?? 1), 2)) return null;
  const missing = role === 'rover' ? 'the rest of the session is missing' : 'its observations after that are missing';
  return {
    file, line: 0, code: ENDS_EARLY_CODES[role],
    message: `the ${role} file's epochs end at ${utcSecondText(lastEpochGpsS)}, ${(gapS / 60).toFixed(1)} min before its header's TIME OF LAST OBS (${utcSecondText(headerLastGpsS)}): the file looks cut off and ${missing}`,
  };
}

/** The rover's epochs end well before its header's TIME OF LAST OBS (fileEndsEarly). */
export function roverEndsEarly(file: string, headerLastGpsS: number | null, intervalS: number | null, lastEpochGpsS: number): Warning | null {
  return fileEndsEarly('rover', file, headerLastGpsS, intervalS, lastEpochGpsS);
}

/** What a run read of one reference file (epochs-read.ts): its first and last observation epochs, and whether it reached the file's end. */
export interface ReferenceRead {
  readonly firstGpsS: number;
  readonly lastGpsS: number;
  readonly toEnd: boolean;
}

/**
 * The span of a reference file for the completeness figures: from the epochs the run read where they
 * say more than the header. Its first epoch read is the file's first (the files are read from their
 * start); its last is the file's last only when the run read it to its end, else the run stopped with
 * the rover and the file goes on at least to where the run stopped (the header's end, when later).
 */
export function referenceSpanRead(headerSpan: TimeSpan, read: ReferenceRead): TimeSpan | null {
  if (!Number.isFinite(read.firstGpsS)) return read.toEnd ? null : headerSpan;
  return { firstGpsS: read.firstGpsS, lastGpsS: read.toEnd ? read.lastGpsS : Math.max(read.lastGpsS, headerSpan.lastGpsS) };
}

/**
 * The reference files' spans from the epochs the run read (referenceSpanRead), joined where one file's
 * epochs follow another's within `joinS` (the correction age limit: a rover epoch in such a gap still has
 * a reference epoch in reach), and a warning for each file read to its end whose epochs end well before
 * its header's TIME OF LAST OBS, unless the other files hold the time it misses (an hourly file cut where
 * the next one begins, both given).
 */
export function referenceCompleteness(
  paths: readonly string[], headers: readonly ObsHeader[], headerSpans: readonly { path: string; span: TimeSpan }[],
  reads: readonly ReferenceRead[], joinS: number, warn: WarningSink,
): TimeSpan[] {
  const spans = paths.map((p, i) => {
    const fromHeader = headerSpans.find((r) => r.path === p)?.span;
    return fromHeader ? referenceSpanRead(fromHeader, reads[i]!) : null;
  });
  for (let i = 0; i < paths.length; i++) {
    const read = reads[i]!, header = headers[i]!;
    if (!read.toEnd) continue;
    const ends = fileEndsEarly('reference', paths[i]!, header.lastObsGpsS, header.intervalS, read.lastGpsS);
    if (!ends) continue;
    const others = spans.filter((s, j): s is TimeSpan => j !== i && s !== null);
    // What is missing: from where the last epoch's reach ends to the header's end.
    const missing = { firstGpsS: Math.min(read.lastGpsS + joinS, header.lastObsGpsS!), lastGpsS: header.lastObsGpsS! };
    if (coveredShare(missing, others) >= FULL_COVERAGE) continue;
    warn(ends);
  }
  return joinedSpans(spans.filter((s): s is TimeSpan => s !== null), joinS);
}

/** Spans joined where the next begins within `stepS` of where the previous ends. */
export function joinedSpans(spans: readonly TimeSpan[], stepS: number): TimeSpan[] {
  const sorted = [...spans].sort((a, b) => a.firstGpsS - b.firstGpsS);
  const out: TimeSpan[] = [];
  for (const s of sorted) {
    const last = out[out.length - 1];
    if (last && s.firstGpsS <= last.lastGpsS + stepS + 1e-3) out[out.length - 1] = { firstGpsS: last.firstGpsS, lastGpsS: Math.max(last.lastGpsS, s.lastGpsS) };
    else out.push(s);
  }
  return out;
}

/** The share of `span` that the union of `covers` overlaps (0..1); a zero-length span is covered when a cover contains it. */
export function coveredShare(span: TimeSpan, covers: readonly TimeSpan[]): number {
  const lengthS = span.lastGpsS - span.firstGpsS;
  const parts = covers
    .map((c) => ({ a: Math.max(c.firstGpsS, span.firstGpsS), b: Math.min(c.lastGpsS, span.lastGpsS) }))
    .filter((p) => p.b >= p.a)
    .sort((x, y) => x.a - y.a);
  if (lengthS <= 0) return parts.length ? 1 : 0;
  let total = 0, end = -Infinity;
  for (const p of parts) {
    const from = Math.max(p.a, end);
    if (p.b > from) total += p.b - from;
    end = Math.max(end, p.b);
  }
  return total / lengthS;
}

/** Rover epochs without a solution and why. */
export interface Unsolved {
  readonly epochs: number;
  readonly roverEpochs: number;
  readonly share: number;
  readonly mainReasons: readonly RejectionCount[];
  /** Share of the rover's span (its epochs' first to last) the reference files cover; null in a single-receiver run. */
  readonly referenceCoverage: number | null;
  /** One sentence for the summary line (empty when every epoch was solved). */
  readonly sentence: string;
  /** More than UNSOLVED_WARNING_SHARE of the epochs unsolved. */
  readonly large: boolean;
}

export function unsolvedEpochs(summary: SessionSummary, roverSpan: TimeSpan, referenceSpans: readonly TimeSpan[] | null): Unsolved {
  const n = summary.epochsByKind.none;
  const total = summary.epochsRover;
  const share = total ? n / total : 0;
  const span = Number.isFinite(summary.firstGpsS) && Number.isFinite(summary.lastGpsS) ? { firstGpsS: summary.firstGpsS, lastGpsS: summary.lastGpsS } : roverSpan;
  const coverage = referenceSpans ? coveredShare(span, referenceSpans) : null;
  const mainReasons = summary.epochRejections.slice(0, 3);
  let sentence = '';
  if (n > 0) {
    const top = mainReasons[0];
    sentence = `${n} of ${total} rover epochs (${(100 * share).toFixed(1)} %) have no solution` +
      (top ? `, ${top.count === n ? 'all' : `${top.count}`} because of "${top.reason}"` : '');
    if (coverage !== null && coverage < FULL_COVERAGE) {
      const refs = referenceSpans!;
      const first = Math.min(...refs.map((r) => r.firstGpsS));
      const last = Math.max(...refs.map((r) => r.lastGpsS));
      sentence += `; the reference covers only ${(100 * coverage).toFixed(0)} % of the rover's span (rover ${utcSecondText(span.firstGpsS)} to ${utcSecondText(span.lastGpsS)}, reference ${utcSecondText(first)} to ${utcSecondText(last)})`;
      // Hourly reference files end on the hour: a rover session beyond them needs the neighbouring hour's file.
      if (last < span.lastGpsS) sentence += `; the reference epochs end before the rover's: give the reference file(s) covering the rest (e.g. the next hourly file)`;
      if (first > span.firstGpsS) sentence += `; the reference epochs begin after the rover's: give the reference file(s) covering the start (e.g. the previous hourly file)`;
    }
  }
  return { epochs: n, roverEpochs: total, share, mainReasons, referenceCoverage: coverage, sentence, large: share > UNSOLVED_WARNING_SHARE };
}

/** summary.json's `completeness` member. */
export function completenessJson(lost: DataLost | null, u: Unsolved): Record<string, unknown> {
  return {
    input_complete: lost === null,
    input_problems: lost ? lost.count : 0,
    input_problem: lost ? lost.sentence : null,
    unsolved_epochs: u.epochs,
    unsolved_percent: Math.round(1000 * u.share) / 10,
    unsolved_main_reasons: u.mainReasons.map((r) => ({ reason: r.reason, count: r.count })),
    reference_covers_percent: u.referenceCoverage === null ? null : Math.round(1000 * u.referenceCoverage) / 10,
    unsolved_sentence: u.sentence || null,
  };
}

/**
 * The pieces that say how complete a run is (run-completeness.ts), where outputs go beside inputs
 * (output-folder.ts) and how far a given reference coordinate may be from the header's (reference-position.ts).
 */
import { mkdirSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import type { SessionSummary } from '@refdelta/core';
import { batchOrder, buildBatchIndexHtml } from '../packages/core/src/report-html/batch-index.js';
import {
  coveredShare, dataLost, fileEndsEarly, joinedSpans, referenceCompleteness, referenceSpanRead, roverEndsEarly, unsolvedEpochs, UNSOLVED_WARNING_SHARE,
} from '../packages/cli/src/run-completeness.js';
import type { ObsHeader, Warning } from '@refdelta/core';
import { inputsInsideFolder, inputsInsideWarning } from '../packages/cli/src/output-folder.js';
import { distanceWords, usableHeaderPosition } from '../packages/cli/src/reference-position.js';
import { tempDir } from './cli-support.js';

describe('coveredShare', () => {
  it('is the share of the span the union of the covers overlaps', () => {
    const span = { firstGpsS: 0, lastGpsS: 100 };
    expect(coveredShare(span, [{ firstGpsS: 50, lastGpsS: 200 }])).toBeCloseTo(0.5);
    // overlapping covers are not counted twice
    expect(coveredShare(span, [{ firstGpsS: 10, lastGpsS: 40 }, { firstGpsS: 30, lastGpsS: 60 }])).toBeCloseTo(0.5);
    expect(coveredShare(span, [{ firstGpsS: 200, lastGpsS: 300 }])).toBe(0);
    expect(coveredShare(span, [{ firstGpsS: -10, lastGpsS: 110 }])).toBe(1);
  });
});

describe('roverEndsEarly', () => {
  it('flags epochs ending more than two intervals before TIME OF LAST OBS, not rounding', () => {
    expect(roverEndsEarly('r.obs', 1000, 1, 999)).toBeNull();
    expect(roverEndsEarly('r.obs', 1000, 30, 950)).toBeNull();
    expect(roverEndsEarly('r.obs', null, 1, 10)).toBeNull();
    const w = roverEndsEarly('r.obs', 1000, 1, 400);
    expect(w?.code).toBe('rover-ends-early');
    expect(w?.message).toMatch(/10\.0 min before its header's TIME OF LAST OBS.*cut off/);
  });
});

describe('a reference file that ends early', () => {
  const header = (lastObsGpsS: number) => ({ lastObsGpsS, intervalS: 5 }) as unknown as ObsHeader;

  it('gets the rover\'s warning with its role named', () => {
    const w = fileEndsEarly('reference', 'ref.obs', 3600, 5, 2700);
    expect(w?.code).toBe('reference-ends-early');
    expect(w?.message).toMatch(/^the reference file's epochs end at .*, 15\.0 min before its header's TIME OF LAST OBS .*: the file looks cut off/);
    expect(fileEndsEarly('reference', 'ref.obs', 3600, 5, 3595)).toBeNull();
    expect(roverEndsEarly('r.obs', 1000, 1, 400)?.message).toMatch(/^the rover file's epochs end/);
  });

  it('its span is the epochs read: to the last when read to its end, else at least to the header\'s end', () => {
    const h = { firstGpsS: 0, lastGpsS: 3600 };
    expect(referenceSpanRead(h, { firstGpsS: 10, lastGpsS: 2700, toEnd: true })).toEqual({ firstGpsS: 10, lastGpsS: 2700 });
    expect(referenceSpanRead(h, { firstGpsS: 0, lastGpsS: 1500, toEnd: false })).toEqual({ firstGpsS: 0, lastGpsS: 3600 });
    expect(referenceSpanRead(h, { firstGpsS: NaN, lastGpsS: NaN, toEnd: false })).toEqual(h);
    expect(referenceSpanRead(h, { firstGpsS: NaN, lastGpsS: NaN, toEnd: true })).toBeNull();
  });

  it('no warning when the next file holds what it misses; joined spans across a gap within the age limit', () => {
    const warnings: Warning[] = [];
    const spans = referenceCompleteness(['a', 'b'], [header(3595), header(3595)],
      [{ path: 'a', span: { firstGpsS: 0, lastGpsS: 3595 } }, { path: 'b', span: { firstGpsS: 0, lastGpsS: 3595 } }],
      [{ firstGpsS: 0, lastGpsS: 2695, toEnd: true }, { firstGpsS: 2700, lastGpsS: 3595, toEnd: true }], 30, (w) => warnings.push(w));
    expect(warnings).toEqual([]);
    expect(spans).toEqual([{ firstGpsS: 0, lastGpsS: 3595 }]);
    referenceCompleteness(['a'], [header(3595)], [{ path: 'a', span: { firstGpsS: 0, lastGpsS: 3595 } }],
      [{ firstGpsS: 0, lastGpsS: 2695, toEnd: true }], 30, (w) => warnings.push(w));
    expect(warnings.map((w) => w.code)).toEqual(['reference-ends-early']);
    expect(joinedSpans([{ firstGpsS: 100, lastGpsS: 200 }, { firstGpsS: 0, lastGpsS: 50 }, { firstGpsS: 60, lastGpsS: 90 }], 30))
      .toEqual([{ firstGpsS: 0, lastGpsS: 200 }]);
    expect(joinedSpans([{ firstGpsS: 0, lastGpsS: 50 }, { firstGpsS: 100, lastGpsS: 200 }], 30)).toHaveLength(2);
  });
});

describe('dataLost', () => {
  it('counts the warnings that mean lost observations, from the tally, and quotes the first', () => {
    const warnings = [
      { file: 'a.obs', line: 0, code: 'antenna-types-differ', message: 'x' },
      { file: 'a.obs', line: 12, code: 'bad-epoch-skipped', message: 'epoch announces 22 satellites but 2 observation records follow (file ends); epoch skipped' },
    ];
    const lost = dataLost(warnings, { total: 5, kept: 2, byCode: { 'antenna-types-differ': 1, 'bad-epoch-skipped': 3, 'rover-ends-early': 1 } });
    expect(lost?.count).toBe(4);
    expect(lost?.sentence).toBe('observations were lost while reading: a.obs:12: epoch announces 22 satellites but 2 observation records follow (file ends); epoch skipped (4 such problems)');
    expect(dataLost(warnings.slice(0, 1), { total: 1, kept: 1, byCode: { 'antenna-types-differ': 1 } })).toBeNull();
  });
});

describe('unsolvedEpochs', () => {
  const summary = (none: number, total: number): SessionSummary => ({
    epochsRover: total, epochsByKind: { differential: total - none, smoothed: 0, standalone: 0, fixed: 0, float: 0, none },
    epochRejections: none ? [{ reason: 'no reference epoch within 30 s', count: none }] : [], firstGpsS: 0, lastGpsS: 100,
  }) as unknown as SessionSummary;

  it('names the count, the main reason and the reference coverage, and is large above the warning share', () => {
    const u = unsolvedEpochs(summary(65, 100), { firstGpsS: 0, lastGpsS: 100 }, [{ firstGpsS: 65, lastGpsS: 100 }]);
    expect(u.large).toBe(true);
    expect(u.referenceCoverage).toBeCloseTo(0.35);
    expect(u.sentence).toMatch(/^65 of 100 rover epochs \(65\.0 %\) have no solution, all because of "no reference epoch within 30 s"; the reference covers only 35 % of the rover's span/);
    expect(u.sentence).toMatch(/the reference epochs begin after the rover's: give the reference file\(s\) covering the start \(e\.g\. the previous hourly file\)$/);
    expect(unsolvedEpochs(summary(65, 100), { firstGpsS: 0, lastGpsS: 100 }, [{ firstGpsS: 0, lastGpsS: 35 }]).sentence)
      .toMatch(/the reference epochs end before the rover's: give the reference file\(s\) covering the rest \(e\.g\. the next hourly file\)$/);
  });

  it('says nothing when every epoch is solved; a small share is not large', () => {
    expect(unsolvedEpochs(summary(0, 100), { firstGpsS: 0, lastGpsS: 100 }, [{ firstGpsS: 0, lastGpsS: 100 }]).sentence).toBe('');
    const u = unsolvedEpochs(summary(UNSOLVED_WARNING_SHARE * 100 - 1, 100), { firstGpsS: 0, lastGpsS: 100 }, [{ firstGpsS: 0, lastGpsS: 100 }]);
    expect(u.large).toBe(false);
    expect(u.sentence).not.toMatch(/covers only/);
  });
});

describe('inputs inside the output folder', () => {
  it('finds inputs in the folder and its subfolders, not beside it', () => {
    const dir = tempDir('rd-beside-');
    mkdirSync(join(dir, 'sub'));
    for (const f of ['a.obs', 'sub/b.nav']) writeFileSync(join(dir, f), 'x');
    const outside = join(tempDir('rd-beside-other-'), 'c.obs');
    writeFileSync(outside, 'x');
    expect(inputsInsideFolder(dir, [join(dir, 'a.obs'), join(dir, 'sub/b.nav'), outside])).toEqual([join(dir, 'a.obs'), join(dir, 'sub/b.nav')]);
    expect(inputsInsideWarning(dir, [])).toBeNull();
    expect(inputsInsideWarning(dir, [join(dir, 'a.obs')])?.message).toBe(
      `the output folder ${dir} (--out) holds input file (a.obs): the outputs are written beside it (no input is overwritten); choose a folder of its own to keep outputs and inputs apart`);
  });
});

describe('reference position words', () => {
  it('a zero or blank header position is no position', () => {
    expect(usableHeaderPosition({ x: 0, y: 0, z: 0 })).toBeNull();
    expect(usableHeaderPosition(null)).toBeNull();
    expect(usableHeaderPosition({ x: 3774089.2, y: -601661.6, z: 5089321.2 })).not.toBeNull();
  });
  it('metres below 10 km, kilometres above', () => {
    expect(distanceWords(196.4)).toBe('196 m');
    expect(distanceWords(8_306_200)).toBe('8306 km');
  });
});

describe('batch index order', () => {
  it('failed sessions first, then sessions with another status than ok, then ok', () => {
    const s = [{ session: 'a', status: 'ok' }, { session: 'b', status: 'incomplete-input' }, { session: 'c', status: 'failed' }];
    expect(batchOrder(s).map((x) => x.session)).toEqual(['c', 'b', 'a']);
  });
  it('the page counts failed sessions and those with another status apart', () => {
    const entry = (session: string, status: string) => ({ session, status, reason: '', epochs: 10, solvedEpochs: 10, points: 1, reportHref: null });
    const html = buildBatchIndexHtml({ title: 't', software: 's', createdUtc: 'c', cautions: [], sessions: [entry('a', 'ok'), entry('b', 'incomplete-input')] });
    expect(html).toContain('2 session(s), 1 with a status other than ok (listed first).');
    expect(html).toContain('<span class="badge other">incomplete-input</span>');
  });
});

/**
 * CLI helpers without a subprocess: the bounded warning list of the Reporter (review finding 31), the
 * slant antenna height with --slant-offset (review finding 32), the RINEX file kind by content and
 * batch session names.
 */
import { describe, expect, it } from 'vitest';
import { Reporter } from '../packages/cli/src/reporter.js';
import { warningsSummary } from '../packages/cli/src/warnings-summary.js';
import { parseAntennaHeights, verticalHeightM } from '../packages/cli/src/solve-options.js';
import { rinexKindOfFirstLine, looksLikeObservationName } from '../packages/cli/src/rinex-kind.js';
import { sessionNames } from '../packages/cli/src/commands/batch.js';
import { UsageError } from '../packages/cli/src/usage-error.js';

describe('Reporter keeps a bounded list of warnings and counts them all', () => {
  it('keeps the first N, counts the rest, and summary.json says so', () => {
    const rep = new Reporter({ quiet: true, jsonLines: false, maxKeptWarnings: 3 });
    for (let i = 0; i < 10; i++) rep.warn({ file: 'x.obs', line: i + 1, code: i % 2 ? 'odd' : 'even', message: `w${i}` });
    expect(rep.warnings.map((w) => w.message)).toEqual(['w0', 'w1', 'w2']);
    const s = warningsSummary(rep);
    expect(s.total).toBe(10);
    expect(s.kept).toBe(3);
    expect(s.not_kept).toBe(7);
    expect(s.by_code).toEqual({ even: 5, odd: 5 });
    expect(String(s.note)).toMatch(/only the first 3 warnings were kept/);
  });

  it('no note when every warning was kept', () => {
    const rep = new Reporter({ quiet: true, jsonLines: false });
    rep.warn({ code: 'a', message: 'one' });
    expect(warningsSummary(rep)).not.toHaveProperty('note');
  });
});

describe('slant antenna height (Pythagoras in the vertical plane through the antenna axis; common practice)', () => {
  it('the measuring point is sqrt(s^2 - r^2) above the mark: 5-12-13 triangle', () => {
    // 1.3^2 - 0.5^2 = 1.44 = 1.2^2 exactly
    expect(verticalHeightM(1.3, 'slant', { radiusM: 0.5, arpAboveSlantPointM: 0 }, 'rover-antenna-height')).toBeCloseTo(1.2, 12);
  });

  it('--slant-offset moves the ARP from the measuring point: ARP 4 cm below it gives 1.16 m', () => {
    expect(verticalHeightM(1.3, 'slant', { radiusM: 0.5, arpAboveSlantPointM: -0.04 }, 'rover-antenna-height')).toBeCloseTo(1.16, 12);
    const h = parseAntennaHeights({ heightKind: 'slant', roverAntennaHeight: '1.3', antennaRadius: '0.5', slantOffset: '-0.04' });
    expect(h.roverHeightM).toBeCloseTo(1.16, 12);
  });

  it('--slant-offset without --antenna-radius, and a slant shorter than the radius, are usage errors', () => {
    expect(() => parseAntennaHeights({ heightKind: 'slant', roverAntennaHeight: '1.3', slantOffset: '-0.04' })).toThrow(UsageError);
    expect(() => verticalHeightM(0.4, 'slant', { radiusM: 0.5, arpAboveSlantPointM: 0 }, 'rover-antenna-height')).toThrow(/not longer than/);
  });

  it('vertical heights are used as given', () => {
    expect(verticalHeightM(1.5, 'vertical', undefined, 'rover-antenna-height')).toBe(1.5);
  });
});

describe('file kind from the RINEX VERSION / TYPE record (RINEX 2.11 and 3.05 tables A1: type in column 21)', () => {
  const line = (version: string, type: string, rest: string) => `${version.padStart(9)}${' '.repeat(11)}${type.padEnd(20)}${rest.padEnd(20)}RINEX VERSION / TYPE`;
  it('observation, navigation, meteorological, not RINEX', () => {
    expect(rinexKindOfFirstLine(line('3.04', 'OBSERVATION DATA', 'M'))).toBe('observation');
    expect(rinexKindOfFirstLine(line('2.11', 'O', 'M (MIXED)'))).toBe('observation');
    expect(rinexKindOfFirstLine(line('3.04', 'N: GNSS NAV DATA', 'M: MIXED'))).toBe('navigation');
    expect(rinexKindOfFirstLine(line('2.10', 'N: GPS NAV DATA', ''))).toBe('navigation');
    expect(rinexKindOfFirstLine(line('2.10', 'G: GLONASS NAV DATA', ''))).toBe('navigation');
    expect(rinexKindOfFirstLine(line('3.04', 'METEOROLOGICAL DATA', ''))).toBe('other');
    expect(rinexKindOfFirstLine('# a CSV file')).toBe('other');
  });
  it('observation-like names (RINEX 2.11 section 4 short names, RINEX 3 long names), compressed too', () => {
    for (const n of ['rover.obs', 'glw1277m.18o', 'york0440.15d', 'ac660270.18o.Z', 'BELE00BRA_R_20240100000_01D_30S_MO.crx.gz', 'x.rnx']) expect(looksLikeObservationName(n)).toBe(true);
    for (const n of ['glw1277m.18n', 'BRDC00IGS_R_20240100000_01D_MN.rnx.gz', 'rover-truth.csv']) expect(looksLikeObservationName(n)).toBe(false);
  });
});

describe('batch session names', () => {
  it('the file name without its extensions; the whole file name where two would clash', () => {
    expect(sessionNames(['/d/base.obs', '/d/rover.obs'])).toEqual(['base', 'rover']);
    expect(sessionNames(['/d/rover.obs', '/d/rover.obs.gz', '/d/glw1277m.18o'])).toEqual(['rover.obs', 'rover.obs.gz', 'glw1277m']);
    expect(sessionNames(['/d/a b.obs'])).toEqual(['a_b']);
  });
});

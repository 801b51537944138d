/**
 * Several --reference files must be one station's (reference-station.ts): real headers of two stations
 * are refused, one station's hourly files pass, a file given twice is kept once with a warning.
 */
import { symlinkSync } from 'node:fs';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import type { Warning } from '@refdelta/core';
import { obsHeaderOf } from '../packages/cli/src/node-io.js';
import { distinctReferencePaths, requireOneStation, stationDifference } from '../packages/cli/src/reference-station.js';
import { dataPath, describeShared, fixturePath } from './support/shared.js';
import { tempDir } from './cli-support.js';

const KFRD = fixturePath('demo/KFRD-reference-5s.obs');

describeShared('requireOneStation (real CORS hourly files)', () => {
  const hour = (h: string) => dataPath(`cors-and-rover-2018-277/reference/glw1277${h}.18o`);

  it('passes one station\'s consecutive hourly files', async () => {
    const files = await Promise.all(['m', 'n', 'o'].map(async (h) => ({ path: hour(h), header: await obsHeaderOf(hour(h)) })));
    expect(() => requireOneStation(files)).not.toThrow();
  });

  it('refuses another station\'s file, naming both files and the marker names', async () => {
    const files = [{ path: KFRD, header: await obsHeaderOf(KFRD) }, { path: hour('m'), header: await obsHeaderOf(hour('m')) }];
    expect(() => requireOneStation(files)).toThrow(`the --reference files ${KFRD} and ${hour('m')} are of two stations (MARKER NAME 'KFRD' and 'GLW1')`);
  });

  it('without marker names, compares the header positions (kilometres apart: two stations)', async () => {
    const a = { path: KFRD, header: { ...(await obsHeaderOf(KFRD)), markerName: '' } };
    const b = { path: hour('m'), header: { ...(await obsHeaderOf(hour('m'))), markerName: '' } };
    expect(stationDifference(a, b)).toMatch(/^APPROX POSITION XYZ \d+ km apart$/);
  });
});

describe('stationDifference: header positions', () => {
  it('takes positions within 500 m for one station, farther for two', async () => {
    const h = await obsHeaderOf(KFRD);
    const p = h.approxPosition!;
    const moved = (dz: number) => ({ path: 'b', header: { ...h, markerName: '', approxPosition: { ...p, z: p.z + dz } } });
    const a = { path: 'a', header: { ...h, markerName: '' } };
    expect(stationDifference(a, moved(120))).toBeNull();
    expect(stationDifference(a, moved(800))).toBe('APPROX POSITION XYZ 800 m apart');
    // A blank or zero header position says nothing.
    expect(stationDifference(a, { path: 'b', header: { ...h, markerName: '', approxPosition: { x: 0, y: 0, z: 0 } } })).toBeNull();
  });
});

describe('stationDifference: marker names', () => {
  it('one station by its four-character id whatever the case or the RINEX 3 nine-character form (RINEX 3.04 4.1); two ids, two stations', async () => {
    const h = await obsHeaderOf(KFRD);
    const named = (markerName: string) => ({ path: markerName, header: { ...h, markerName } });
    expect(stationDifference(named('GLW1'), named('glw1'))).toBeNull();
    expect(stationDifference(named('GLW1'), named('GLW100USA'))).toBeNull();
    expect(stationDifference(named('GLW1'), named('KFRD'))).toBe("MARKER NAME 'GLW1' and 'KFRD'");
  });
});

describe('distinctReferencePaths', () => {
  it('keeps a file given twice (by two paths) once, with a warning', async () => {
    const dir = tempDir('rd-refs-');
    const link = join(dir, 'again.obs');
    symlinkSync(KFRD, link);
    const warnings: Warning[] = [];
    expect(await distinctReferencePaths([KFRD, link, KFRD], (w) => warnings.push(w))).toEqual([KFRD]);
    expect(warnings.map((w) => w.code)).toEqual(['reference-file-repeated', 'reference-file-repeated']);
    expect(warnings[0]!.message).toContain(`also as ${KFRD}`);
    expect(warnings[1]!.message).toContain('the same path');
  });
});

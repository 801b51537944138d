import { expect, it } from 'vitest';
import { dataPath, describeShared, fileChunks } from '../../../../test/support/shared.js';
import type { Warning } from '../errors.js';
import { decodeUtf8Chunks, readObsStream } from '../rinex/index.js';
import { readNav } from '../rinex/nav-reader.js';
import { inspectNav } from './inspect-nav.js';
import { inspectObs } from './inspect-obs.js';
import { navInspectionText, obsInspectionText } from './inspect-text.js';

const BASE = 'cors-and-rover-2018-277/static-run/base.obs';
const NAV = 'cors-and-rover-2018-277/reference/glw1277m.18n';

describeShared('inspect on real files', () => {
  it('describes the static-run base file as its header and the data README say', async () => {
    const path = dataPath(BASE);
    const warnings: Warning[] = [];
    const s = await readObsStream(path, decodeUtf8Chunks(fileChunks(path)), { onWarning: (w) => warnings.push(w) });
    const r = await inspectObs(s, { warnings, layers: [] });
    expect(r.format.version).toBeCloseTo(3.03, 5); // header line 1
    expect(r.station.marker_name).toBe('base');
    // data README: base epochs 1 s apart with gaps up to 24 s; C1C L1C D1C S1C for GPS, GLONASS, QZSS.
    expect(r.interval.detected_s).toBeCloseTo(1, 2);
    expect(r.gaps.count).toBeGreaterThan(0);
    expect(Math.max(...r.gaps.list.map((g) => g.length_s))).toBeLessThanOrEqual(24.5);
    expect(Object.keys(r.observation_types).sort()).toEqual(['G', 'J', 'R']);
    expect(r.observation_types.G.rinex3).toEqual(['C1C', 'L1C', 'D1C', 'S1C']);
    // TIME OF FIRST / LAST OBS: 2018-10-04 12:37:16.99 and 12:58:40.991 GPS.
    expect(r.time_span!.first.gps.startsWith('2018-10-04T12:37:16.99')).toBe(true);
    expect(r.time_span!.last.gps.startsWith('2018-10-04T12:58:40.99')).toBe(true);
    expect(r.approx_position!.x_m).toBeCloseTo(3774089.212, 3); // data README
    expect(r.satellites.per_system.G.count).toBeGreaterThan(4);
    expect(obsInspectionText(r)).toMatch(/RINEX 3\/4 observation 3\.03/);
  });

  it('describes a RINEX 2.10 GPS navigation file', async () => {
    const path = dataPath(NAV);
    const nav = await readNav(path, decodeUtf8Chunks(fileChunks(path)));
    const r = inspectNav(nav);
    expect(r.format.version).toBeCloseTo(2.1, 5); // header line 1: 2.10 NAVIGATION DATA
    expect(Object.keys(r.per_system)).toEqual(['G']);
    expect(r.ionosphere).toContain('GPS Klobuchar'); // header has ION ALPHA / ION BETA
    expect(r.leap_seconds).toBe(18); // header LEAP SECONDS 18
    expect(r.time_span!.first.gps.startsWith('2018-10-0')).toBe(true);
    expect(navInspectionText(r)).toMatch(/GPS \(G\)/);
  });
});

/**
 * Doppler velocity on real data: the static run of 2018-10-04 (data README, cors-and-rover-2018-277/
 * static-run: "both receivers still"), rover.obs with the CORS GPS + GLONASS broadcast navigation. A
 * still receiver has zero velocity, so the estimated speed is pure error: an outside truth.
 * Plus a synthetic epoch built from the same broadcast orbits with a known receiver velocity (the model
 * of Misra & Enge 2011 eq. 6.20 applied forwards: self-consistency of sign and geometry).
 */
import { existsSync, readFileSync } from 'node:fs';
import { beforeAll, describe, expect, it } from 'vitest';
import { dataPath, describeShared, fileChunks } from '../../../../test/support/shared.js';
import { openText } from '../compress/index.js';
import { readObsStream } from '../rinex/obs-reader.js';
import { readNav } from '../rinex/nav-reader.js';
import { mergeNav } from '../rinex/nav-reader.js';
import type { ObsEpoch, SatObservations } from '../gnss/obs-types.js';
import { carrierWavelengthM } from '../gnss/obs-codes.js';
import { EphemerisStore, satelliteAtTransmission, SPEED_OF_LIGHT_MS } from '../orbit/index.js';
import { ecefToGeodetic, enuToEcefDelta } from '../geodesy/index.js';
import { gpsSFromWeekTow } from '../time/index.js';
import { dopplerVelocity } from './index.js';

const D = 'cors-and-rover-2018-277';
const DEG = Math.PI / 180;

async function nav() {
  const parts = [];
  for (const f of ['glw1277m.18n', 'glw1277m.18g']) {
    const p = dataPath(`${D}/reference/${f}`);
    parts.push(await readNav(p, (async function* () { yield readFileSync(p, 'latin1'); })()));
  }
  return mergeNav(parts);
}

function quantile(xs: number[], p: number): number {
  const s = [...xs].sort((a, b) => a - b);
  return s[Math.min(s.length - 1, Math.max(0, Math.ceil(p * s.length) - 1))];
}

describeShared('dopplerVelocity on the real static run (receivers still)', () => {
  const speeds: number[] = [];
  const vertical: number[] = [];
  let epochs = 0;
  beforeAll(async () => {
    const store = new EphemerisStore(await nav());
    const path = dataPath(`${D}/static-run/rover.obs`);
    const opened = await openText(path, fileChunks(path));
    const stream = await readObsStream(path, opened.text);
    const pos = stream.header.approxPosition!;
    const channels = new Map([...store.glonassChannels(), ...stream.header.glonassChannels]);
    for await (const e of stream.epochs) {
      if (e.flag > 1 || e.sats.length === 0) continue;
      epochs++;
      const v = dopplerVelocity(e, pos, store, { systems: ['G', 'R'], elevationMaskRad: 10 * DEG, glonassChannels: channels });
      if (v) { speeds.push(v.speedMS); vertical.push(Math.abs(v.velocityEnuMS.u)); }
    }
  }, 60_000);

  it('solves nearly every epoch; speed median < 0.05 m/s, 95 % < 0.2 m/s (still receiver: truth 0)', () => {
    expect(epochs).toBeGreaterThan(1000);
    expect(speeds.length / epochs).toBeGreaterThan(0.95);
    const med = quantile(speeds, 0.5), p95 = quantile(speeds, 0.95);
    // eslint-disable-next-line no-console
    console.log(`static-run Doppler speed: n=${speeds.length}/${epochs}, median ${med.toFixed(4)} m/s, 95 % ${p95.toFixed(4)} m/s, |vU| median ${quantile(vertical, 0.5).toFixed(4)} m/s`);
    // data README: "both receivers still" -> true speed 0
    expect(med).toBeLessThan(0.05);
    expect(p95).toBeLessThan(0.2);
  });
});

describeShared('dopplerVelocity recovers a known velocity (synthetic Doppler from real broadcast orbits)', () => {
  it('walking 1.2 m/s north-east and 0.1 m/s up, clock drift 150 m/s: recovered to 1 mm/s', async () => {
    const store = new EphemerisStore(await nav());
    const rx = { x: 3774089.23, y: -601662.33, z: 5089321.17 };
    const g = ecefToGeodetic(rx);
    const vEnu = { e: 1.2 * Math.SQRT1_2, n: 1.2 * Math.SQRT1_2, u: 0.1 };
    const vRx = enuToEcefDelta(vEnu, g.latRad, g.lonRad);
    const t = gpsSFromWeekTow(2021, 4 * 86400 + 12 * 3600 + 43 * 60); // 2018-10-04 12:43 GPS (inside the nav file's hour)
    const codes = ['C1C', 'L1C', 'D1C', 'S1C'];
    const sats: SatObservations[] = [];
    for (const sat of store.satellites()) {
      if (!sat.startsWith('G')) continue;
      const sel = store.select(sat, t);
      if (!sel.eph) continue;
      const at = satelliteAtTransmission(sel.eph, t, null, rx, 'L1');
      const dx = at.posM.x - rx.x, dy = at.posM.y - rx.y, dz = at.posM.z - rx.z;
      const r = Math.hypot(dx, dy, dz);
      if ((dx * Math.cos(g.latRad) * Math.cos(g.lonRad) + dy * Math.cos(g.latRad) * Math.sin(g.lonRad) + dz * Math.sin(g.latRad)) / r < Math.sin(12 * DEG)) continue;
      // forward model, Misra & Enge 2011 eq. 6.20: rhoDot = e.(v_sat - v_rx) + c(dtDot_rx - dtDot_sat); D = -rhoDot / lambda
      const rhoDot = (dx * (at.velMS.x - vRx.x) + dy * (at.velMS.y - vRx.y) + dz * (at.velMS.z - vRx.z)) / r + 150 - SPEED_OF_LIGHT_MS * at.clock.driftSS;
      const hz = -rhoDot / carrierWavelengthM('G', 'D1C');
      sats.push({ sat, codes, values: new Float64Array([r + 150, NaN, hz, 45]), lli: new Uint8Array(4), ssi: new Uint8Array(4) });
    }
    expect(sats.length).toBeGreaterThanOrEqual(6);
    const epoch: ObsEpoch = { tagGpsS: t, flag: 0, receiverClockOffsetS: null, line: 1, sats, event: null };
    const v = dopplerVelocity(epoch, rx, store, { systems: ['G'], elevationMaskRad: 10 * DEG, glonassChannels: new Map() });
    expect(v).not.toBeNull();
    // the pseudorange given (r + 150) shifts the transmission time by 0.5 us: sub-mm/s velocity effect
    expect(Math.abs(v!.velocityEnuMS.e - vEnu.e)).toBeLessThan(1e-3);
    expect(Math.abs(v!.velocityEnuMS.n - vEnu.n)).toBeLessThan(1e-3);
    expect(Math.abs(v!.velocityEnuMS.u - vEnu.u)).toBeLessThan(1e-3);
    expect(v!.speedMS).toBeCloseTo(1.2, 2);
    expect(v!.clockDriftMS.G).toBeCloseTo(150, 2);
    expect(v!.rejected).toEqual([]);
  });
});

describe('dopplerVelocity without enough satellites', () => {
  it('returns null', () => {
    const store = EphemerisStore.fromEphemerides([]);
    const epoch: ObsEpoch = { tagGpsS: 1e9, flag: 0, receiverClockOffsetS: null, line: 1, sats: [], event: null };
    expect(dopplerVelocity(epoch, { x: 6378137, y: 0, z: 0 }, store, { systems: ['G'], elevationMaskRad: 0, glonassChannels: new Map() })).toBeNull();
  });
});

const DEMO_ROVER = new URL('../../../../fixtures/demo/rover-1s.obs', import.meta.url).pathname;
const DEMO_NAV = new URL('../../../../fixtures/demo/broadcast-mixed.nav', import.meta.url).pathname;
const DEMO_TRUTH = new URL('../../../../fixtures/demo/rover-truth.csv', import.meta.url).pathname;
const HAVE_DEMO = existsSync(DEMO_ROVER);
if (!HAVE_DEMO) console.warn('[skip] Doppler velocity on the demo: fixtures/demo/ not generated yet');

describe.skipIf(!HAVE_DEMO)('dopplerVelocity on the simulated demo rover (self-consistency with the simulator)', () => {
  it('walking ~1.2 m/s between points (README), still on the points', async () => {
    const truth = new Map<number, { x: number; y: number; z: number; point: string }>();
    for (const l of readFileSync(DEMO_TRUTH, 'utf8').split('\n')) {
      if (l.startsWith('#') || l.startsWith('gps_week') || l.trim() === '') continue;
      const [w, tow, x, y, z, point] = l.split(',');
      truth.set(Math.round(gpsSFromWeekTow(Number(w), Number(tow))), { x: Number(x), y: Number(y), z: Number(z), point });
    }
    const navText = readFileSync(DEMO_NAV, 'latin1');
    const store = new EphemerisStore(await readNav(DEMO_NAV, (async function* () { yield navText; })()));
    const opened = await openText(DEMO_ROVER, fileChunks(DEMO_ROVER));
    const stream = await readObsStream(DEMO_ROVER, opened.text);
    const moving: number[] = [], still: number[] = [];
    for await (const e of stream.epochs) {
      if (e.flag > 1 || e.sats.length === 0) continue;
      const t = truth.get(Math.round(e.tagGpsS));
      if (!t) continue;
      const v = dopplerVelocity(e, t, store, { systems: ['G', 'E'], elevationMaskRad: 10 * DEG, glonassChannels: new Map() });
      if (v) (t.point === 'moving' ? moving : still).push(v.speedMS);
    }
    expect(moving.length).toBeGreaterThan(300);
    expect(still.length).toBeGreaterThan(600);
    const mMed = quantile(moving, 0.5), sMed = quantile(still, 0.5), s95 = quantile(still, 0.95);
    // eslint-disable-next-line no-console
    console.log(`demo Doppler speed: moving median ${mMed.toFixed(3)} m/s (n=${moving.length}), still median ${sMed.toFixed(4)} 95 % ${s95.toFixed(4)} m/s (n=${still.length})`);
    // fixtures/demo/README: "walking at 1.2 m/s on straight lines" (turns and starts make the median a bit lower)
    expect(Math.abs(mMed - 1.2)).toBeLessThan(0.1);
    expect(sMed).toBeLessThan(0.05);
    expect(s95).toBeLessThan(0.2);
  }, 30_000);
});

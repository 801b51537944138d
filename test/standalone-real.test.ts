/**
 * Standalone positioning on real permanent stations, against the coordinate each header publishes
 * (APPROX POSITION XYZ: the networks' published coordinates, ../shared/data/README.md). Per epoch, the
 * horizontal and vertical error; H50/H95/V95 per station, mode and constellation are printed as a table.
 *
 * Bounds (best mode the data allows, i.e. ionosphere-free where two bands are tracked): horizontal 95 %
 * within 5 m, vertical 95 % within 10 m (project goal, tighter than the GPS SPS Performance Standard's
 * 9 m / 15 m at 95 %, check-values.md "Accuracy facts"); the single-frequency GPS solution must meet the
 * SPS figures themselves.
 *
 * Epochs are subsampled to keep the file fast: every 10th epoch of the 30 s day files (288 epochs,
 * whole day) and every 5th of the first glw1 hour (144 epochs at 5 s).
 */
import { beforeAll, expect, it } from 'vitest';
import { openText } from '../packages/core/src/compress/index.js';
import { readObsStream, readNav, mergeNav } from '../packages/core/src/rinex/index.js';
import { carrierFrequencyHz, type ObsEpoch, type ObsHeader, type NavData } from '../packages/core/src/gnss/index.js';
import { EphemerisStore, satelliteAtTransmission, SPEED_OF_LIGHT_MS } from '../packages/core/src/orbit/index.js';
import { solveStandaloneEpoch, type StandaloneContext, type StandaloneMode } from '../packages/core/src/standalone/index.js';
import { azimuthElevation, ecefToEnu, ecefToGeodetic } from '../packages/core/src/geodesy/index.js';
import { troposphereDelayM } from '../packages/core/src/observables/atmosphere-model.js';
import type { GnssSystem } from '../packages/core/src/gnss/types.js';
import { dataPath, describeShared, fileChunks } from './support/shared.js';

const DEG = Math.PI / 180;

async function textOf(rel: string): Promise<AsyncIterable<string>> {
  return (await openText(rel, fileChunks(dataPath(rel)))).text;
}

async function loadNav(rels: readonly string[]): Promise<NavData> {
  const parts: NavData[] = [];
  for (const r of rels) parts.push(await readNav(r, await textOf(r)));
  return mergeNav(parts);
}

/** Every `every`-th observation epoch (event records skipped), at most `max`. */
async function loadObs(rel: string, every: number, max: number): Promise<{ header: ObsHeader; epochs: ObsEpoch[] }> {
  const s = await readObsStream(rel, await textOf(rel));
  const epochs: ObsEpoch[] = [];
  let i = 0;
  for await (const e of s.epochs) {
    if (e.flag > 1) continue;
    if (i++ % every === 0) epochs.push(e);
    if (epochs.length >= max) break;
  }
  return { header: s.header, epochs };
}

interface Station {
  readonly header: ObsHeader;
  readonly epochs: readonly ObsEpoch[];
  readonly nav: NavData;
  readonly store: EphemerisStore;
  readonly channels: ReadonlyMap<number, number>;
}

async function station(obs: string, nav: readonly string[], every: number, max: number): Promise<Station> {
  const n = await loadNav(nav);
  const o = await loadObs(obs, every, max);
  const store = new EphemerisStore(n);
  const channels = new Map(store.glonassChannels());
  for (const [slot, k] of o.header.glonassChannels) channels.set(slot, k);
  return { header: o.header, epochs: o.epochs, nav: n, store, channels };
}

function context(st: Station, systems: readonly GnssSystem[], mode: 'auto' | 'single'): StandaloneContext {
  return {
    store: st.store, iono: st.nav.ionosphere, systems, elevationMaskRad: 10 * DEG,
    // sigma^2 = a^2 + b^2/sin^2(el) with a = b = 0.3 m: common practice (check-values.md "Weighting").
    weighting: { aM: 0.3, bM: 0.3, minElevationRad: 5 * DEG },
    frequencyMode: mode, glonassChannels: st.channels,
  };
}

interface Figures {
  readonly solved: number;
  readonly epochs: number;
  readonly h50M: number;
  readonly h95M: number;
  readonly v95M: number;
  /** Share of solved epochs whose every constellation was ionosphere-free. */
  readonly ionoFreeShare: number;
}

/** Empirical quantile (nearest rank). */
function quantile(values: readonly number[], p: number): number {
  const s = [...values].sort((a, b) => a - b);
  return s.length === 0 ? NaN : s[Math.min(s.length - 1, Math.ceil(p * s.length) - 1)];
}

function figures(st: Station, systems: readonly GnssSystem[], mode: 'auto' | 'single'): Figures {
  const ctx = context(st, systems, mode);
  const truth = st.header.approxPosition!;
  const h: number[] = [], v: number[] = [];
  let ionoFree = 0;
  for (const e of st.epochs) {
    const r = solveStandaloneEpoch(e, st.header, ctx, null);
    if (!r.fix.ok) continue;
    const d = ecefToEnu(r.fix.positionM, truth);
    h.push(Math.hypot(d.e, d.n));
    v.push(Math.abs(d.u));
    if ([...r.modeBySystem.values()].every((m: StandaloneMode) => m === 'ionosphere-free')) ionoFree++;
  }
  return { solved: h.length, epochs: st.epochs.length, h50M: quantile(h, 0.5), h95M: quantile(h, 0.95), v95M: quantile(v, 0.95), ionoFreeShare: ionoFree / Math.max(1, h.length) };
}

const table: string[] = [];
function row(name: string, systems: readonly GnssSystem[], mode: 'auto' | 'single', f: Figures): void {
  const modeName = mode === 'auto' ? 'iono-free' : 'single-freq';
  table.push(`${name.padEnd(9)} ${modeName.padEnd(11)} ${systems.join('').padEnd(5)} ${String(f.solved).padStart(4)}/${String(f.epochs).padEnd(4)} `
    + `${f.h50M.toFixed(2).padStart(6)} ${f.h95M.toFixed(2).padStart(6)} ${f.v95M.toFixed(2).padStart(6)}   ${(100 * f.ionoFreeShare).toFixed(0).padStart(3)} %`);
}

/** Figures for the combination and each constellation alone, both modes; returns the combination's. */
function report(name: string, st: Station, systems: readonly GnssSystem[], extra: readonly GnssSystem[] = []): { best: Figures; single: Figures; perSystem: Map<string, Figures> } {
  const perSystem = new Map<string, Figures>();
  let best: Figures | null = null, single: Figures | null = null;
  for (const mode of ['auto', 'single'] as const) {
    const all = figures(st, systems, mode);
    row(name, systems, mode, all);
    if (mode === 'auto') best = all; else single = all;
    for (const s of [...(systems.length > 1 ? systems : []), ...extra]) {
      const f = figures(st, [s], mode);
      row(name, [s], mode, f);
      perSystem.set(`${s}-${mode}`, f);
    }
    if (systems.length === 1) perSystem.set(`${systems[0]}-${mode}`, all);
  }
  return { best: best!, single: single!, perSystem };
}

function printTable(): void {
  // eslint-disable-next-line no-console
  console.log(['station   mode        sys   solved     H50m   H95m   V95m  all-IF', ...table].join('\n'));
}

describeShared('standalone positioning against published station coordinates', () => {
  const stations = new Map<string, Station>();
  beforeAll(async () => {
    stations.set('BELE', await station('single-station/BELE00BRA_R_20240100000_01D_30S_MO.crx.gz', ['single-station/BRDC00IGS_R_20240100000_01D_MN.rnx.gz'], 10, 10_000));
    stations.set('DGAR', await station('single-station/dgar0100.24o.gz', ['single-station/brdc0100.24n.gz', 'single-station/brdc0100.24g.gz'], 10, 10_000));
    const R = 'cors-and-rover-2018-277/reference/';
    stations.set('glw1', await station(`${R}glw1277m.18o`, [`${R}glw1277m.18n`, `${R}glw1277m.18g`], 5, 10_000));
  });

  it('BELE (equatorial, GPS + Galileo + BeiDou, whole day): ionosphere-free within 5 m H95 / 10 m V95', () => {
    const st = stations.get('BELE')!;
    expect(st.epochs.length).toBeGreaterThan(280); // 2880 epochs at 30 s (file name 01D_30S), every 10th
    const r = report('BELE', st, ['G', 'E', 'C'], ['R']);
    expect(r.best.solved).toBe(st.epochs.length);
    expect(r.best.ionoFreeShare).toBeGreaterThan(0.9);
    expect(r.best.h95M).toBeLessThan(5); // project goal; SPS PS 9 m (check-values.md)
    expect(r.best.v95M).toBeLessThan(10); // project goal; SPS PS 15 m
    const g = r.perSystem.get('G-single')!;
    expect(g.h95M).toBeLessThan(9); // SPS PS: <= 9 m horizontal 95 % (check-values.md "Accuracy facts")
    expect(g.v95M).toBeLessThan(15); // SPS PS: <= 15 m vertical 95 %
  });

  it('DGAR (GPS, RINEX 2.11, whole day): ionosphere-free within 5 m H95 / 10 m V95', () => {
    const st = stations.get('DGAR')!;
    expect(st.epochs.length).toBeGreaterThan(280);
    const r = report('DGAR', st, ['G'], ['R']);
    expect(r.best.solved).toBe(st.epochs.length);
    expect(r.best.ionoFreeShare).toBeGreaterThan(0.9);
    expect(r.best.h95M).toBeLessThan(5);
    expect(r.best.v95M).toBeLessThan(10);
    expect(r.single.h95M).toBeLessThan(9); // SPS PS (check-values.md)
    expect(r.single.v95M).toBeLessThan(15);
    const gr = figures(st, ['G', 'R'], 'auto');
    row('DGAR', ['G', 'R'], 'auto', gr);
    expect(gr.h95M).toBeLessThan(5);
    expect(gr.v95M).toBeLessThan(10);
  });

  it('glw1 CORS (GPS + GLONASS, 12:00-12:59): ionosphere-free within 5 m H95 / 10 m V95', () => {
    // The header coordinate is probably ETRS89, ~0.7 m from the broadcast orbits' frame here
    // (../shared/data/README.md, from memory): sub-metre figures below include that offset.
    const st = stations.get('glw1')!;
    expect(st.epochs.length).toBe(144); // 720 epochs at 5 s, every 5th
    const r = report('glw1', st, ['G', 'R']);
    expect(r.best.solved).toBe(st.epochs.length);
    expect(r.best.h95M).toBeLessThan(5);
    expect(r.best.v95M).toBeLessThan(10);
    const g = r.perSystem.get('G-auto')!;
    expect(g.h95M).toBeLessThan(5);
    expect(g.v95M).toBeLessThan(10);
    expect(r.single.h95M).toBeLessThan(9); // SPS PS (check-values.md)
    expect(r.single.v95M).toBeLessThan(15);
    printTable();
  });

  it('glw1 GLONASS: ionosphere-free code residuals at the known point grow with the frequency channel (receiver inter-frequency bias)', () => {
    // Residual of the C1/P2 ionosphere-free code at the published coordinate, minus the GPS median of the
    // epoch (receiver clock), averaged per satellite; then a least-squares line against channel k.
    // A physical limit, not a bug: the orbit and clock are the same for C1 alone, whose slope is smaller.
    const st = stations.get('glw1')!;
    const truth = st.header.approxPosition!;
    const g = ecefToGeodetic(truth);
    const sums = new Map<string, { ifM: number; c1M: number; n: number }>();
    for (const e of st.epochs) {
      const gpsIf: number[] = [], gpsC1: number[] = [];
      const glo: { sat: string; ifM: number; c1M: number }[] = [];
      for (const s of e.sats) {
        const sys = s.sat[0] as GnssSystem;
        if (sys !== 'G' && sys !== 'R') continue;
        const sel = st.store.select(s.sat, e.tagGpsS);
        if (sel.eph === null) continue;
        const value = (c: string) => { const i = s.codes.indexOf(c); return i < 0 ? NaN : s.values[i]; };
        const p1 = value('C1C'), p2 = value(sys === 'G' ? 'C2W' : 'C2P');
        if (!(p1 > 1e6 && p2 > 1e6)) continue;
        const k = sys === 'R' ? st.channels.get(Number(s.sat.slice(1))) : undefined;
        const f1 = carrierFrequencyHz(sys, 'C1C', k), f2 = carrierFrequencyHz(sys, 'C2P', k);
        // P_IF = (f1^2 P1 - f2^2 P2) / (f1^2 - f2^2): IS-GPS-200 20.3.3.3.3.3
        const pIf = (f1 * f1 * p1 - f2 * f2 * p2) / (f1 * f1 - f2 * f2);
        const at = satelliteAtTransmission(sel.eph, e.tagGpsS, pIf, truth, sys === 'G' ? 'L1L2-IF' : 'G1');
        const ae = azimuthElevation(truth, at.posM, g.latRad, g.lonRad);
        if (ae.elevationRad < 10 * DEG) continue;
        const model = at.rangeM! - SPEED_OF_LIGHT_MS * at.clock.offsetS + troposphereDelayM(g, ae.elevationRad, 277);
        // C1 alone keeps the ionosphere: removed only in the combination; its per-satellite mean still shows the bias trend.
        if (sys === 'G') { gpsIf.push(pIf - model); gpsC1.push(p1 - model); } else glo.push({ sat: s.sat, ifM: pIf - model, c1M: p1 - model });
      }
      if (gpsIf.length < 5) continue;
      const medIf = quantile(gpsIf, 0.5), medC1 = quantile(gpsC1, 0.5);
      for (const x of glo) {
        const a = sums.get(x.sat) ?? { ifM: 0, c1M: 0, n: 0 };
        sums.set(x.sat, { ifM: a.ifM + x.ifM - medIf, c1M: a.c1M + x.c1M - medC1, n: a.n + 1 });
      }
    }
    const pts = [...sums].filter(([, a]) => a.n >= 20).map(([sat, a]) => ({ k: st.channels.get(Number(sat.slice(1)))!, ifM: a.ifM / a.n }));
    expect(pts.length).toBeGreaterThanOrEqual(5);
    const mk = pts.reduce((s, p) => s + p.k, 0) / pts.length, mr = pts.reduce((s, p) => s + p.ifM, 0) / pts.length;
    const slope = pts.reduce((s, p) => s + (p.k - mk) * (p.ifM - mr), 0) / pts.reduce((s, p) => s + (p.k - mk) ** 2, 0);
    // eslint-disable-next-line no-console
    console.log(`glw1 GLONASS iono-free residual vs channel: slope ${slope.toFixed(2)} m/channel; ` + pts.map((p) => `k${p.k}:${p.ifM.toFixed(1)}`).join(' '));
    // Measured 0.5-0.6 m per channel (hours m and p): ~7 m across k = -7..+6, while GPS spreads +-1.5 m.
    expect(slope).toBeGreaterThan(0.25);
  });

  it('CEDA: a navigation file without GLONASS and with few Galileo records gives "no ephemeris" reasons', async () => {
    const st = await station('single-station/CEDA00USA_R_20182100000_23H_15S_MO.rnx.gz', ['single-station/CEDA00USA_R_20182100000_01D_MN.rnx.gz'], 50, 200);
    expect(st.store.systemsWithEphemeris()).toEqual(new Set(['E'])); // the nav file holds Galileo only (README)
    const reasons = new Map<string, string>();
    for (const e of st.epochs) {
      const r = solveStandaloneEpoch(e, st.header, context(st, ['E', 'R'], 'auto'), null);
      for (const s of r.satellites) reasons.set(s.sat, s.reason);
    }
    const glo = [...reasons].filter(([sat]) => sat[0] === 'R');
    const gal = [...reasons].filter(([sat]) => sat[0] === 'E');
    expect(glo.length).toBeGreaterThan(3);
    for (const [, reason] of glo) expect(reason).toBe('no ephemeris');
    const missing = gal.filter(([, reason]) => reason === 'no ephemeris' || reason.startsWith('ephemeris too old'));
    expect(missing.length).toBeGreaterThan(gal.length / 2);
    // eslint-disable-next-line no-console
    console.log(`CEDA every 50th epoch: ${glo.length} GLONASS 'no ephemeris'; Galileo: ` + gal.map(([s, r]) => `${s} ${r || 'used'}`).join('; '));
  });
});

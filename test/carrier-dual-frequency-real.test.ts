/**
 * Carrier phase on further bands with real dual-frequency recordings (../shared/data, README there). The
 * project has no two dual-frequency receivers observing together, so each station is processed against
 * itself: a zero baseline whose single differences are exactly zero, with real signal lists (RINEX 2.11
 * C1 L1 P2 L2 C2 of glw1277m.18o; RINEX 3.05 GPS/GLONASS/Galileo/BeiDou of BELE00BRA), real arcs, slips and
 * GLONASS channels. Truth: the header coordinate (the station itself). What these prove: the further
 * bands are read, matched between receivers and used (their rows, their ambiguities fixed to zero), and
 * their effect on fixing from a cold start (the formal precision, which the real geometry sets). What they
 * cannot prove: anything about noise, multipath or the ionosphere, which a zero baseline cancels.
 */
import { readFileSync } from 'node:fs';
import { beforeAll, expect, it } from 'vitest';
import { ecefToEnu } from '../packages/core/src/geodesy/index.js';
import { withDefaults } from '../packages/core/src/session/index.js';
import { solveCarrierSession, withCarrierDefaults, type CarrierEpochSolution, type CarrierOptions, type CarrierSummary } from '../packages/core/src/carrier/index.js';
import { openText } from '../packages/core/src/compress/index.js';
import { mergeNav, readNav } from '../packages/core/src/rinex/nav-reader.js';
import { readObsStream } from '../packages/core/src/rinex/obs-reader.js';
import type { NavData } from '../packages/core/src/rinex/nav-types.js';
import type { ObsStream } from '../packages/core/src/rinex/obs-types.js';
import type { EcefM } from '../packages/core/src/gnss/types.js';
import { dataPath, describeShared } from './support/shared.js';

async function* bytesOf(path: string): AsyncIterable<Uint8Array> { yield new Uint8Array(readFileSync(path)); }

async function obs(rel: string, fromGpsS = -Infinity, toGpsS = Infinity): Promise<ObsStream> {
  const s = await readObsStream(rel.split('/').pop()!, (await openText(rel, bytesOf(dataPath(rel)))).text);
  async function* epochs() { for await (const e of s.epochs) { if (e.tagGpsS >= toGpsS) break; if (e.tagGpsS >= fromGpsS) yield e; } }
  return { file: s.file, header: s.header, epochs: epochs() };
}

async function nav(rels: readonly string[]): Promise<NavData> {
  const parts = [];
  for (const r of rels) parts.push(await readNav(r.split('/').pop()!, (await openText(r, bytesOf(dataPath(r)))).text));
  return mergeNav(parts);
}

async function zeroBaseline(rel: string, n: NavData, markM: EcefM, fromGpsS: number, toGpsS: number, carrier: Partial<CarrierOptions> = {}): Promise<{ sols: CarrierEpochSolution[]; summary: CarrierSummary }> {
  const run = await solveCarrierSession(async () => ({ rover: await obs(rel, fromGpsS, toGpsS), references: [await obs(rel, fromGpsS, toGpsS)], nav: n }),
    withDefaults({ reference: { position: { ecef: markM, frame: { name: 'unstated', epochYear: NaN } }, source: 'header (test)' }, reduceToMark: true }), withCarrierDefaults(carrier));
  const sols: CarrierEpochSolution[] = [];
  for await (const s of run.epochs) sols.push(s);
  return { sols, summary: run.summary() };
}

function worstFixedM(sols: readonly CarrierEpochSolution[], markM: EcefM): number {
  let w = 0;
  for (const s of sols) if (s.kind === 'fixed' && s.position) { const e = ecefToEnu(s.position.ecef, markM); w = Math.max(w, Math.hypot(e.e, e.n, e.u)); }
  return w;
}

const signalsUsed = (sols: readonly CarrierEpochSolution[]): Set<string> => new Set(sols.flatMap((s) => s.satellites.filter((r) => r.used).map((r) => `${r.sat[0]} ${r.signal}`)));

describeShared('carrier phase on further bands, real dual-frequency stations against themselves (zero baselines)', () => {
  const GLW = 'cors-and-rover-2018-277/reference/glw1277m.18o';
  const BELE = 'single-station/BELE00BRA_R_20240100000_01D_30S_MO.crx.gz';
  let glwNav: NavData, beleNav: NavData, glwMark: EcefM, beleMark: EcefM, glwFirst: number, beleFirst: number;
  beforeAll(async () => {
    glwNav = await nav(['m.18n', 'm.18g'].map((x) => 'cors-and-rover-2018-277/reference/glw1277' + x));
    beleNav = await nav(['single-station/BRDC00IGS_R_20240100000_01D_MN.rnx.gz']);
    const g = (await obs(GLW)).header, b = (await obs(BELE)).header;
    glwMark = g.approxPosition!; beleMark = b.approxPosition!;
    glwFirst = g.firstObsGpsS!; beleFirst = b.firstObsGpsS!;
  });

  it('glw1277m.18o (RINEX 2.11, 5 s), 30 one-minute windows each alone: GPS L2W and GLONASS L2P used; every epoch fixed at the mark; the forward pass fixes every epoch (L1 alone: fewer)', async () => {
    let dualForward = 0, singleForward = 0, epochs = 0, worst = 0;
    const signals = new Set<string>();
    for (let t = glwFirst; t + 60 <= glwFirst + 1800; t += 60) {
      const d = await zeroBaseline(GLW, glwNav, glwMark, t, t + 60);
      const s = await zeroBaseline(GLW, glwNav, glwMark, t, t + 60, { frequencies: 'single' });
      epochs += d.sols.length;
      dualForward += d.sols.filter((x) => x.forwardKind === 'fixed').length;
      singleForward += s.sols.filter((x) => x.forwardKind === 'fixed').length;
      expect(d.sols.every((x) => x.kind === 'fixed')).toBe(true);
      worst = Math.max(worst, worstFixedM(d.sols, glwMark));
      for (const x of signalsUsed(d.sols)) signals.add(x);
    }
    console.log(`glw1277m zero baseline, 60 s windows: ${epochs} epochs all fixed, worst ${(1000 * worst).toFixed(2)} mm; forward pass alone ${(100 * dualForward / epochs).toFixed(1)} % fixed with L1+L2 (${(100 * singleForward / epochs).toFixed(1)} % with L1 alone); signals ${[...signals].sort().join(', ')}`);
    expect(epochs).toBeGreaterThanOrEqual(350);
    expect(worst).toBeLessThanOrEqual(0.001);
    expect(signals.has('G L2W') && signals.has('R L2P') && signals.has('G L1C') && signals.has('R L1C')).toBe(true);
    expect(dualForward).toBe(epochs);
    expect(singleForward).toBeLessThan(epochs);
  });

  it('BELE00BRA (RINEX 3.05, 30 s), two hours: GPS L2W/L5X, GLONASS L2C, Galileo L5X/L7X, BeiDou L6I/L7I used, with their ambiguities; every epoch fixed at the mark, residuals zero', async () => {
    const d = await zeroBaseline(BELE, beleNav, beleMark, beleFirst, beleFirst + 2 * 3600);
    const signals = signalsUsed(d.sols);
    const worst = worstFixedM(d.sols, beleMark);
    const maxFixed = Math.max(...d.sols.map((s) => s.fixedAmbiguities));
    const maxResidual = Math.max(...d.sols.flatMap((s) => s.satellites.filter((r) => r.used && Number.isFinite(r.residualM)).map((r) => Math.abs(r.residualM))));
    console.log(`BELE zero baseline 2 h: ${d.sols.filter((s) => s.kind === 'fixed').length}/${d.sols.length} fixed, worst ${(1000 * worst).toFixed(2)} mm, up to ${maxFixed} ambiguities fixed in an epoch, largest residual ${(1000 * maxResidual).toFixed(3)} mm; signals ${[...signals].sort().join(', ')}; ${d.summary.notes.join(' | ')}`);
    for (const s of ['G L2W', 'G L5X', 'R L2C', 'E L5X', 'E L7X', 'C L6I', 'C L7I']) expect(signals.has(s), s).toBe(true);
    expect(d.sols.length).toBe(240);
    expect(d.sols.every((s) => s.kind === 'fixed')).toBe(true);
    expect(worst).toBeLessThanOrEqual(0.001);
    expect(maxResidual).toBeLessThanOrEqual(0.001);
  });
});

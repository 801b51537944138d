/**
 * Between-receiver code offsets that stay constant over a session: GLONASS channel offsets learnt in a
 * first pass over the whole session and applied from the first epoch of the second; per-satellite
 * offsets of the other constellations sampled from the second pass's fixes and reported.
 *
 * GLONASS: satellites on different frequency channels meet different inter-frequency code delays in each
 * receiver, and the difference does not cancel between receivers, even of one model (e.g. Wanninger 2012,
 * J. Geodesy 86, "Carrier-phase inter-frequency biases of GLONASS receivers", for the code part).
 * Sample: the satellite's single-difference misclosure at the position held by the other constellations,
 * less the relative clock of one reference constellation (the same all session, so every sample carries
 * the same inter-system bias, which the GLONASS clock then absorbs). One offset per frequency channel,
 * always applied (the physics says it exists), its variance added to the rows.
 *
 * Any satellite of another constellation: sample = its leave-one-out residual in the epoch's fix (v_i / r_i,
 * r_i = Qvv_ii / Qyy_ii the redundancy number: the misclosure against the position and clock held by the
 * other satellites; Teunissen 2000, "Testing theory", 4.2). Estimated, tested (significant, and stable over
 * the two halves of the session) and reported, but not removed: over one session a satellite-constant
 * code offset of a CDMA signal cannot be told from that satellite's multipath and from the other
 * satellites' errors the leave-one-out residual also carries (removing the significant ones made the real
 * static run worse: H95 2.27 -> 2.52 m). As nothing of them is applied, they are sampled from the fixes
 * the second pass makes anyway (the solutions reported, reference code smoothed when it is), and a session
 * without GLONASS channel offsets to learn makes no fix in its first pass.
 */
import type { GnssSystem, SatId } from '../gnss/index.js';
import type { CodeOffsetSource, SingleDifferenceEpoch } from '../differencing/index.js';
import { ConstantOffsetSamples, estimateConstantOffset, solvePositionFix, type ConstantOffsetEstimate, type FixOptions, type PositionFix } from '../solve/index.js';
import type { EcefM } from '../gnss/index.js';
import type { CodeOffsetReport } from './solution-types.js';

const glonassKey = (k: number): string => `R channel ${k >= 0 ? '+' : ''}${k}`;

function report(key: string, e: ConstantOffsetEstimate, applied: boolean): CodeOffsetReport {
  return {
    key, offsetM: e.offsetM, sigmaM: e.sigmaM, scatterM: e.scatterM, samples: e.samples, nEff: e.nEff,
    significant: e.significant, stable: e.stable, applied,
  };
}

/** Spacing of the samples (s): code errors are correlated over tens of seconds, denser samples add little. */
const SAMPLE_SPACING_S = 5;

/** Only a tested fix with redundancy may teach: its position holds for the samples. */
function teaches(fix: ReturnType<typeof solvePositionFix>): fix is PositionFix {
  return fix.ok && fix.test.dof >= 2 && fix.test.passed;
}

/** Learns the samples, epoch by epoch: GLONASS channels in the first pass, other satellites in the second. */
export class CodeOffsetSurvey {
  readonly samples = new ConstantOffsetSamples();
  private lastChannelS = -Infinity;
  private lastSatelliteS = -Infinity;

  constructor(
    private readonly learnGlonass: boolean,
    /** The constellation whose relative clock GLONASS samples are referred to. */
    private readonly clockSystem: GnssSystem | null,
    private readonly fixOptions: FixOptions,
  ) {}

  /** Whether the first pass has anything to learn (GLONASS channel offsets). */
  get learnsInFirstPass(): boolean {
    return this.learnGlonass && this.clockSystem !== null;
  }

  /** Whether a first-pass epoch at this time would teach anything (samples are spaced): ask before building it. */
  wants(tagGpsS: number): boolean {
    return tagGpsS - this.lastChannelS >= SAMPLE_SPACING_S;
  }

  /**
   * First pass: learns the GLONASS channel samples of one epoch (raw code, no offsets applied) at the
   * position the other constellations give; returns that fix's position and clock when it had one.
   */
  learnChannels(sd: SingleDifferenceEpoch, start: EcefM): { positionM: EcefM; clockM: number } | null {
    if (!this.wants(sd.epoch.tagGpsS) || sd.usable.length < 5) return null;
    const glonass = new Set<SatId>();
    for (const p of sd.usable) if (p.system === 'R') glonass.add(p.sat);
    const withoutGlonass = (x: EcefM, ex: ReadonlySet<SatId>) => sd.rowsAt(x, glonass.size ? new Set([...ex, ...glonass]) : ex);
    const fix = solvePositionFix(withoutGlonass, start, this.fixOptions);
    if (!teaches(fix)) return null;
    this.lastChannelS = sd.epoch.tagGpsS;
    const solved = { positionM: fix.positionM, clockM: fix.clocksM.values().next().value ?? sd.codeClockM };
    const clockM = this.clockSystem ? fix.clocksM.get(this.clockSystem) : undefined;
    if (!this.learnGlonass || clockM === undefined || glonass.size === 0) return solved;
    const others = new Set<SatId>(fix.rejected.map((r) => r.sat));
    for (const p of sd.usable) if (p.system !== 'R') others.add(p.sat);
    for (const row of sd.rowsAt(fix.positionM, others)) {
      const channel = sd.usable.find((p) => p.sat === row.sat)?.channel;
      if (channel !== undefined) this.samples.add(glonassKey(channel), row.misclosureM - clockM);
    }
    return solved;
  }

  /** Second pass: the leave-one-out residuals of the satellites other than GLONASS in the epoch's fix. */
  learnSatellites(tagGpsS: number, fix: ReturnType<typeof solvePositionFix>): void {
    if (tagGpsS - this.lastSatelliteS < SAMPLE_SPACING_S || !teaches(fix)) return;
    this.lastSatelliteS = tagGpsS;
    for (const u of fix.used) {
      if (u.row.sat[0] === 'R' || !Number.isFinite(u.wTest) || u.wTest === 0) continue;
      const qvv = (u.residualM / u.wTest) ** 2;
      const redundancy = qvv / u.row.varianceM2;
      if (redundancy > 0.05) this.samples.add(u.row.sat, u.residualM / redundancy);
    }
  }
}

/** The estimated offsets, as the differencing stage asks for them. */
export class SessionCodeOffsets implements CodeOffsetSource {
  readonly needsGlonassChannel: boolean;
  private readonly applied = new Map<string, { offsetM: number; varianceM2: number }>();
  private readonly channelReports: CodeOffsetReport[] = [];
  /** For a GLONASS channel never learnt: the channels' mean, with their spread as its uncertainty. */
  private readonly unknownChannel: { offsetM: number; varianceM2: number };

  /** Made once the first pass is over: the channel offsets are final; the satellites' samples go on coming. */
  constructor(private readonly survey: CodeOffsetSurvey, glonassOffsets: boolean, private readonly alpha: number) {
    this.needsGlonassChannel = glonassOffsets;
    const channels: { key: string; e: ConstantOffsetEstimate }[] = [];
    for (const key of survey.samples.keys().sort()) {
      if (!key.startsWith('R channel') || !glonassOffsets) continue;
      const e = estimateConstantOffset(survey.samples.samples(key), alpha);
      if (!e) continue;
      channels.push({ key, e });
      this.applied.set(key, { offsetM: e.offsetM, varianceM2: e.sigmaM ** 2 });
      this.channelReports.push(report(key, e, true));
    }
    const mean = channels.length ? channels.reduce((s, c) => s + c.e.offsetM, 0) / channels.length : 0;
    const spread2 = channels.length > 1 ? channels.reduce((s, c) => s + (c.e.offsetM - mean) ** 2, 0) / (channels.length - 1) : 1;
    this.unknownChannel = { offsetM: mean, varianceM2: spread2 };
    // GLONASS offsets are reported about their mean: the common part is the GLONASS clock's.
    for (const r of this.channelReports) r.relativeToChannelMeanM = r.offsetM - mean;
  }

  /** Every estimate, in key order: the channels applied and the satellites sampled so far (reported only). */
  get reports(): CodeOffsetReport[] {
    const satellites: CodeOffsetReport[] = [];
    for (const key of this.survey.samples.keys()) {
      if (key.startsWith('R channel')) continue;
      const e = estimateConstantOffset(this.survey.samples.samples(key), this.alpha);
      if (e) satellites.push(report(key, e, false));
    }
    return [...this.channelReports, ...satellites].sort((a, b) => (a.key < b.key ? -1 : a.key > b.key ? 1 : 0));
  }

  private lookup(sat: SatId, system: GnssSystem, channel: number | undefined): { offsetM: number; varianceM2: number } | undefined {
    if (system === 'R' && this.needsGlonassChannel) return channel === undefined ? undefined : this.applied.get(glonassKey(channel)) ?? this.unknownChannel;
    return this.applied.get(sat);
  }

  offsetM(sat: SatId, system: GnssSystem, channel: number | undefined): number {
    return this.lookup(sat, system, channel)?.offsetM ?? 0;
  }

  offsetVarianceM2(sat: SatId, system: GnssSystem, channel: number | undefined): number {
    return this.lookup(sat, system, channel)?.varianceM2 ?? 0;
  }

  varianceFactor(): number {
    return 1;
  }
}

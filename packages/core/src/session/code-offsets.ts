/**
 * Between-receiver code offsets that stay constant over a session, learnt in a first pass over the whole
 * session and applied from the first epoch of the second.
 *
 * GLONASS: satellites on different frequency channels meet different inter-frequency code delays in each
 * receiver, and the difference does not cancel between receivers, even of one model (e.g. Wanninger 2012,
 * J. Geodesy 86, "Carrier-phase inter-frequency biases of GLONASS receivers", for the code part).
 * Sample: the satellite's single-difference misclosure at the position held by the other constellations,
 * less the relative clock of one reference constellation (the same all session, so every sample carries
 * the same inter-system bias, which the GLONASS clock then absorbs). One offset per frequency channel,
 * always applied (the physics says it exists), its variance added to the rows.
 *
 * Any satellite of another constellation: sample = its leave-one-out residual in the fix (v_i / r_i,
 * r_i = Qvv_ii / Qyy_ii the redundancy number: the misclosure against the position and clock held by the
 * other satellites; Teunissen 2000, "Testing theory", 4.2). Estimated, tested (significant, and stable over
 * the two halves of the session) and reported, but not removed: over one session a satellite-constant
 * code offset of a CDMA signal cannot be told from that satellite's multipath and from the other
 * satellites' errors the leave-one-out residual also carries (removing the significant ones made the real
 * static run worse: H95 2.27 -> 2.52 m).
 */
import type { GnssSystem, SatId } from '../gnss/index.js';
import type { CodeOffsetSource, SingleDifferenceEpoch } from '../differencing/index.js';
import { ConstantOffsetSamples, estimateConstantOffset, solvePositionFix, type ConstantOffsetEstimate, type FixOptions } from '../solve/index.js';
import type { EcefM } from '../gnss/index.js';
import type { CodeOffsetReport } from './solution-types.js';

const glonassKey = (k: number): string => `R channel ${k >= 0 ? '+' : ''}${k}`;

/** Learns the samples, epoch by epoch, in the first pass. */
export class CodeOffsetSurvey {
  readonly samples = new ConstantOffsetSamples();
  private lastS = -Infinity;

  constructor(
    private readonly learnGlonass: boolean,
    /** The constellation whose relative clock GLONASS samples are referred to. */
    private readonly clockSystem: GnssSystem | null,
    private readonly fixOptions: FixOptions,
    /** Samples this far apart at least (s): code errors are correlated over tens of seconds, denser samples add little. */
    private readonly spacingS = 5,
  ) {}

  /** Whether an epoch at this time would teach anything (samples are spaced): ask before building it. */
  wants(tagGpsS: number): boolean {
    return tagGpsS - this.lastS >= this.spacingS;
  }

  /** Learns from one epoch (raw code, no offsets applied); returns the fix's position and clock when it had one. */
  learn(sd: SingleDifferenceEpoch, start: EcefM): { positionM: EcefM; clockM: number } | null {
    if (!this.wants(sd.epoch.tagGpsS) || sd.usable.length < 5) return null;
    const glonass = new Set<SatId>();
    for (const p of sd.usable) if (p.system === 'R') glonass.add(p.sat);
    const withoutGlonass = (x: EcefM, ex: ReadonlySet<SatId>) => sd.rowsAt(x, glonass.size ? new Set([...ex, ...glonass]) : ex);
    const fix = solvePositionFix(withoutGlonass, start, this.fixOptions);
    // Only a tested fix with redundancy may teach: its position holds for the samples.
    if (!fix.ok || fix.test.dof < 2 || !fix.test.passed) return null;
    this.lastS = sd.epoch.tagGpsS;
    const solved = { positionM: fix.positionM, clockM: fix.clocksM.values().next().value ?? sd.codeClockM };
    for (const u of fix.used) {
      if (!Number.isFinite(u.wTest) || u.wTest === 0) continue;
      const qvv = (u.residualM / u.wTest) ** 2;
      const redundancy = qvv / u.row.varianceM2;
      if (redundancy > 0.05) this.samples.add(u.row.sat, u.residualM / redundancy);
    }
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
}

/** The estimated offsets, as the differencing stage asks for them. */
export class SessionCodeOffsets implements CodeOffsetSource {
  readonly needsGlonassChannel: boolean;
  private readonly applied = new Map<string, { offsetM: number; varianceM2: number }>();
  readonly reports: CodeOffsetReport[] = [];
  /** For a GLONASS channel never learnt: the channels' mean, with their spread as its uncertainty. */
  private readonly unknownChannel: { offsetM: number; varianceM2: number };

  constructor(survey: CodeOffsetSurvey, glonassOffsets: boolean, alpha: number) {
    this.needsGlonassChannel = glonassOffsets;
    const channels: { key: string; e: ConstantOffsetEstimate }[] = [];
    for (const key of survey.samples.keys().sort()) {
      const e = estimateConstantOffset(survey.samples.samples(key), alpha);
      if (!e) continue;
      const isChannel = key.startsWith('R channel');
      if (isChannel && !glonassOffsets) continue;
      if (isChannel) channels.push({ key, e });
      const apply = isChannel;
      if (apply) this.applied.set(key, { offsetM: e.offsetM, varianceM2: e.sigmaM ** 2 });
      this.reports.push({
        key, offsetM: e.offsetM, sigmaM: e.sigmaM, scatterM: e.scatterM, samples: e.samples, nEff: e.nEff,
        significant: e.significant, stable: e.stable, applied: apply,
      });
    }
    const mean = channels.length ? channels.reduce((s, c) => s + c.e.offsetM, 0) / channels.length : 0;
    const spread2 = channels.length > 1 ? channels.reduce((s, c) => s + (c.e.offsetM - mean) ** 2, 0) / (channels.length - 1) : 1;
    this.unknownChannel = { offsetM: mean, varianceM2: spread2 };
    // GLONASS offsets are reported about their mean: the common part is the GLONASS clock's.
    for (const r of this.reports) if (r.key.startsWith('R channel')) r.relativeToChannelMeanM = r.offsetM - mean;
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

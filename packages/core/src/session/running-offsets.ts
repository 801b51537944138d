/**
 * GLONASS channel offsets learnt forwards as the epochs are solved (differencing/glonass-channel-offsets.ts):
 * each GLONASS misclosure at the position of the solution without GLONASS, less their mean (the GLONASS
 * relative clock), is one sample of its channel's offset.
 */
import type { EcefM, GnssSystem, SatId } from '../gnss/index.js';
import { solvePositionFix, type FixOptions, type PositionFix } from '../solve/index.js';
import type { CodeOffsetSource, GlonassChannelOffsets, SingleDifferenceEpoch } from '../differencing/index.js';

export function runningOffsetSource(offsets: GlonassChannelOffsets): CodeOffsetSource {
  return {
    offsetM: (_sat: SatId, system: GnssSystem, k: number | undefined) => (system === 'R' && k !== undefined ? offsets.offset(k) : 0),
    offsetVarianceM2: () => 0,
    varianceFactor: (_sat: SatId, system: GnssSystem, k: number | undefined) => (system === 'R' && k !== undefined ? offsets.varianceFactor(k) : 1),
    needsGlonassChannel: true,
  };
}

export function learnChannelOffsets(offsets: GlonassChannelOffsets, sd: SingleDifferenceEpoch, fix: PositionFix, fixOptions: FixOptions): void {
  const rejected = new Set(fix.rejected.map((r) => r.sat));
  const glonass = new Set(sd.usable.filter((p) => p.system === 'R').map((p) => p.sat));
  const buildWithoutGlonass = (x: EcefM, ex: ReadonlySet<SatId>) => sd.rowsAt(x, new Set([...ex, ...glonass, ...rejected]));
  const withoutGlonass = solvePositionFix(buildWithoutGlonass, fix.positionM, { ...fixOptions, maxRejections: 0, minSatellites: 4 });
  // Only a fix with redundancy that passes its test may teach the offsets.
  if (!withoutGlonass.ok || withoutGlonass.test.dof < 2 || !withoutGlonass.test.passed) return;
  const excluded = new Set<SatId>([...rejected]);
  for (const p of sd.usable) if (p.system !== 'R') excluded.add(p.sat);
  const rows = sd.rowsAt(withoutGlonass.positionM, excluded);
  if (rows.length < 2) return;
  let sw = 0, swy = 0;
  for (const r of rows) { sw += 1 / r.varianceM2; swy += r.misclosureM / r.varianceM2; }
  const clock = swy / sw;
  for (const r of rows) {
    const p = sd.usable.find((q) => q.sat === r.sat);
    if (p?.channel !== undefined) offsets.update(p.channel, r.misclosureM - clock);
  }
}

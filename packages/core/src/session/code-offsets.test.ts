/** How the session applies what its first pass learnt (self-consistency: samples fed directly). */
import { describe, expect, it } from 'vitest';
import { CodeOffsetSurvey, SessionCodeOffsets } from './code-offsets.js';
import { DEFAULT_FIX_OPTIONS } from '../solve/index.js';
import { rng, gauss } from '../../../../test/support/random.js';

function surveyWith(series: Record<string, number>): CodeOffsetSurvey {
  const s = new CodeOffsetSurvey(true, 'G', DEFAULT_FIX_OPTIONS);
  const r = rng(4);
  for (let i = 0; i < 400; i++) for (const [key, offset] of Object.entries(series)) s.samples.add(key, offset + 0.5 * gauss(r));
  return s;
}

describe('session code offsets (self-consistency)', () => {
  const survey = surveyWith({ 'R channel +1': -2.1, 'R channel -3': 1.6, 'R channel +5': 0.2, G07: 1.2 });
  const offsets = new SessionCodeOffsets(survey, true, 0.001);

  it('each GLONASS channel gets its own offset, with the variance of its estimate', () => {
    expect(offsets.offsetM('R03', 'R', 1)).toBeCloseTo(-2.1, 1);
    expect(offsets.offsetM('R11', 'R', -3)).toBeCloseTo(1.6, 1);
    expect(offsets.offsetVarianceM2('R03', 'R', 1)).toBeGreaterThan(0);
    expect(offsets.offsetVarianceM2('R03', 'R', 1)).toBeLessThan(0.01);
  });

  it('a channel never learnt: the channels\' mean, its uncertainty their spread', () => {
    expect(offsets.offsetM('R20', 'R', 6)).toBeCloseTo((-2.1 + 1.6 + 0.2) / 3, 1);
    expect(Math.sqrt(offsets.offsetVarianceM2('R20', 'R', 6))).toBeGreaterThan(1);
  });

  it('a satellite of another constellation: reported with its significance, not removed', () => {
    expect(offsets.offsetM('G07', 'G', undefined)).toBe(0);
    const g = offsets.reports.find((r) => r.key === 'G07')!;
    expect(g.significant).toBe(true);
    expect(g.applied).toBe(false);
    const r = offsets.reports.find((x) => x.key === 'R channel +1')!;
    expect(r.relativeToChannelMeanM).toBeCloseTo(-2.1 - (-2.1 + 1.6 + 0.2) / 3, 1);
  });

  it('satellite samples taken after the first pass (from the second pass\'s fixes) are reported; the channels stay as applied', () => {
    const s = surveyWith({ 'R channel +1': -2.1, 'R channel -3': 1.6 });
    const o = new SessionCodeOffsets(s, true, 0.001);
    expect(o.reports.map((r) => r.key)).toEqual(['R channel +1', 'R channel -3']);
    const r = rng(5);
    for (let i = 0; i < 400; i++) s.samples.add('E11', -0.9 + 0.5 * gauss(r));
    expect(o.reports.map((x) => x.key)).toEqual(['E11', 'R channel +1', 'R channel -3']);
    expect(o.reports.find((x) => x.key === 'E11')!.applied).toBe(false);
    expect(o.offsetM('E11', 'E', undefined)).toBe(0);
    expect(o.offsetM('R03', 'R', 1)).toBeCloseTo(-2.1, 1);
  });

  it('without the GLONASS policy of channel offsets nothing is applied to GLONASS', () => {
    const none = new SessionCodeOffsets(survey, false, 0.001);
    expect(none.offsetM('R03', 'R', 1)).toBe(0);
    expect(none.needsGlonassChannel).toBe(false);
  });
});

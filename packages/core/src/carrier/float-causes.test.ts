import { describe, expect, it } from 'vitest';
import {
  CAUSE_DISTURBED, CAUSE_NONE, CAUSE_RATIO, CAUSE_SUCCESS_RATE, CAUSE_TOO_FEW_AMBIGUITIES,
  combinedFloatReason, floatCauseText, tooFewSatellitesReason,
} from './float-causes.js';

const limits = { ratioThreshold: 3, minSuccessRate: 0.999 };

describe('float causes in words', () => {
  it('one pass: each cause with its numbers and the option it failed', () => {
    expect(floatCauseText(CAUSE_RATIO, 2.104, NaN, limits)).toBe('ratio test below 3 (2.10)');
    expect(floatCauseText(CAUSE_TOO_FEW_AMBIGUITIES, 4, 5, limits)).toBe('too few ambiguities to fix (4, need 5)');
    expect(floatCauseText(CAUSE_DISTURBED, 11, 18, limits)).toBe('tracking disturbed (11 arc starts and ends, more than half of the 18 arcs): no fix tried');
    expect(floatCauseText(CAUSE_SUCCESS_RATE, 6.28, NaN, limits)).toBe('fix success rate below 99.9 % (ratio test passed: 6.28)');
    expect(floatCauseText(CAUSE_RATIO, NaN, NaN, limits)).toBe('integer search found no candidate');
    expect(floatCauseText(CAUSE_NONE, NaN, NaN, limits)).toBe('');
  });

  it('both passes float: the same cause once, different causes per pass', () => {
    expect(combinedFloatReason([1, 1], [CAUSE_RATIO, CAUSE_RATIO], [2.1, 1.8], [NaN, NaN], limits)).toBe('ratio test below 3 in both passes (forward 2.10, backward 1.80)');
    expect(combinedFloatReason([1, 1], [CAUSE_TOO_FEW_AMBIGUITIES, CAUSE_TOO_FEW_AMBIGUITIES], [3, 3], [5, 5], limits)).toBe('too few ambiguities to fix in both passes (3, need 5)');
    expect(combinedFloatReason([1, 1], [CAUSE_DISTURBED, CAUSE_TOO_FEW_AMBIGUITIES], [15, 4], [18, 5], limits))
      .toBe('forward: tracking disturbed (15 arc starts and ends, more than half of the 18 arcs): no fix tried; backward: too few ambiguities to fix (4, need 5)');
  });

  it('a pass fixed: the fixes disagree, or the other pass did not confirm it (with why it is float there)', () => {
    expect(combinedFloatReason([2, 2], [CAUSE_NONE, CAUSE_NONE], [NaN, NaN], [NaN, NaN], limits)).toBe('forward and backward fixes disagree');
    expect(combinedFloatReason([2, 1], [CAUSE_NONE, CAUSE_RATIO], [NaN, 2.22], [NaN, NaN], limits))
      .toBe('forward fix not confirmed by the backward pass, whose float position differs beyond its precision (backward float: ratio test below 3 (2.22))');
    expect(combinedFloatReason([1, 2], [CAUSE_TOO_FEW_AMBIGUITIES, CAUSE_NONE], [4, NaN], [5, NaN], limits)).toMatch(/^backward fix not confirmed by the forward pass.*\(forward float: too few ambiguities to fix \(4, need 5\)\)$/);
  });

  it('one pass only solved the epoch', () => {
    expect(combinedFloatReason([0, 1], [7, CAUSE_RATIO], [3, 2.5], [5, NaN], limits)).toBe('only the backward pass has a solution, float: ratio test below 3 (2.50)');
  });

  it('too few satellites: the elevation mask named when the satellites below it would have been enough', () => {
    expect(tooFewSatellitesReason({ used: 4, needed: 5, common: 20, belowMask: 16, maskDeg: 55 }))
      .toBe('too few satellites above the elevation mask (4 usable above 55 deg, need 5; 16 below it)');
    expect(tooFewSatellitesReason({ used: 3, needed: 5, common: 3, belowMask: 0, maskDeg: 10 }))
      .toBe('too few satellites (3 usable, need 5; 3 common to rover and reference)');
    expect(tooFewSatellitesReason({ used: 2, needed: 5, common: 5, belowMask: 1, maskDeg: 7.5 }))
      .toBe('too few satellites (2 usable, need 5; 5 common to rover and reference, 1 of them below the 7.5 deg elevation mask)');
  });
});

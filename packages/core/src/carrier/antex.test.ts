/**
 * The ANTEX reader and the antenna model against the calibration files' own grids (../shared/data/antex,
 * IGS ANTEX 1.4 excerpts; README there): values read at grid nodes, interpolated between them, and the
 * correction's sign for a phase-centre offset straight up (ANTEX 1.4 sign convention, from memory: the
 * phase centre is nearer the satellite, so the correction to the antenna reference point is positive).
 */
import { readFileSync } from 'node:fs';
import { expect, it } from 'vitest';
import { antennaCorrectionM, findAntenna, phaseCentreVariationM, readAntex } from './antex.js';
import { InputError } from '../errors.js';
import { describeShared, sharedPath } from '../../../../test/support/shared.js';

describeShared('ANTEX reader (../shared/data/antex/igs14-small.atx)', () => {
  const data = () => readAntex('igs14-small.atx', readFileSync(sharedPath('data/antex/igs14-small.atx'), 'latin1'));

  it('keeps the receiver antennas and skips the satellite ones', () => {
    const d = data();
    expect(d.antennas.has('3S-02-TSADM     NONE')).toBe(true);
    expect([...d.antennas.keys()].some((k) => /^[GRECJ]\d\d$/.test(k.slice(20)))).toBe(false);
    for (const k of d.antennas.keys()) expect(k.startsWith('BLOCK') || k.startsWith('GLONASS') || k.startsWith('GALILEO')).toBe(false);
  });

  it('3S-02-TSADM NONE, G01: offset N/E/U 2.36/3.07/254.34 mm; NOAZI 0.00 at zenith, -0.23 mm at 5 deg, -0.115 mm half-way (file lines 780-782)', () => {
    const cal = findAntenna(data(), '3S-02-TSADM     NONE')!;
    const f = cal.frequencies.get('G01')!;
    expect(f.offsetNeuM[0]).toBeCloseTo(0.00236, 8);
    expect(f.offsetNeuM[1]).toBeCloseTo(0.00307, 8);
    expect(f.offsetNeuM[2]).toBeCloseTo(0.25434, 8);
    expect(phaseCentreVariationM(cal, f, 0, 0)).toBeCloseTo(0, 9);
    expect(phaseCentreVariationM(cal, f, 5, 123)).toBeCloseTo(-0.00023, 9);
    expect(phaseCentreVariationM(cal, f, 2.5, 0)).toBeCloseTo(-0.000115, 9);
  });

  it('an azimuth grid (AERAT1675_120 SPKE, DAZI 15): the 0 and 15 deg rows at 5 deg zenith, and between them', () => {
    const cal = findAntenna(data(), 'AERAT1675_120   SPKE')!;
    const f = cal.frequencies.get('G01')!;
    expect(cal.dAzimuthDeg).toBe(15);
    expect(phaseCentreVariationM(cal, f, 5, 0)).toBeCloseTo(-0.00009, 9);
    expect(phaseCentreVariationM(cal, f, 10, 15)).toBeCloseTo(-0.00033, 9);
    expect(phaseCentreVariationM(cal, f, 10, 7.5)).toBeCloseTo(-0.00033, 9);
  });

  it('the correction to the antenna reference point: + UP offset at zenith, less the variation', () => {
    const cal = findAntenna(data(), '3S-02-TSADM     NONE')!;
    expect(antennaCorrectionM(cal, 'G', '1', Math.PI / 2, 0)).toBeCloseTo(0.25434, 6);
    // GLONASS without its own entry takes the GPS one of the same band number (common practice).
    expect(antennaCorrectionM(cal, 'R', '1', Math.PI / 2, 0)).toBeCloseTo(0.25434, 6);
  });
});

it('a file that is not ANTEX is refused with its name and line', () => {
  expect(() => readAntex('x.atx', 'hello\nworld\n')).toThrow(InputError);
  expect(() => readAntex('x.atx', 'hello\nworld\n')).toThrow(/x\.atx/);
});

import { describe, expect, it } from 'vitest';
import { geodeticToEcef, degToRad } from '../geodesy/index.js';
import { enuDifferences, horizontalVerticalStats, percentile, PositionSeries, positionScatter, seriesScatter } from './statistics.js';

describe('percentile (Hyndman & Fan 1996 definition 7)', () => {
  it('matches worked values of linear interpolation between closest ranks', () => {
    // Worked example of the C = 1 variant (Wikipedia "Percentile", linear interpolation between closest ranks): 40th of 15,20,35,40,50 = 29.
    expect(percentile([15, 20, 35, 40, 50], 0.4)).toBeCloseTo(29, 12);
    // Definition 7 at p = 0.5 is the ordinary median: (2 + 3) / 2 for 1..4 (also numpy.percentile default).
    expect(percentile([4, 1, 3, 2], 0.5)).toBeCloseTo(2.5, 12);
    expect(percentile([7], 0.95)).toBe(7);
    expect(percentile([], 0.5)).toBeNaN();
    expect(() => percentile([1], 1.5)).toThrow(RangeError);
  });
});

describe('ENU differences and scatter', () => {
  it('rotates a difference into the local frame of the origin', () => {
    // check-values.md #2 and #3 (GeographicLib CartConvert manual): 33.3 N 44.4 E 6000 m relative to 33 N 44 E 20 m.
    const p = geodeticToEcef({ latRad: degToRad(33.3), lonRad: degToRad(44.4), heightM: 6000 });
    const o = geodeticToEcef({ latRad: degToRad(33), lonRad: degToRad(44), heightM: 20 });
    const [d] = enuDifferences([p], o);
    expect(d.e).toBeCloseTo(37288.97, 1);
    expect(d.n).toBeCloseTo(33374.29, 1);
    expect(d.u).toBeCloseTo(5783.64, 1);
  });

  it('NSSDA factors and percentiles of a constructed error set', () => {
    // FGDC-STD-007.3-1998 3.2.2: accuracy_r = 1.7308 RMSE_r, accuracy_z = 1.9600 RMSE_z.
    const s = horizontalVerticalStats([{ e: 3, n: 4, u: -1 }, { e: 0, n: 0, u: 1 }]);
    expect(s.horizontalMedianM).toBeCloseTo(2.5, 12); // |(3,4)| = 5 (Pythagoras), median of 0 and 5
    expect(s.nssdaHorizontal95M).toBeCloseTo(1.7308 * Math.sqrt((9 + 16) / 2), 12);
    expect(s.nssdaVertical95M).toBeCloseTo(1.96, 12);
    expect(s.verticalMaxM).toBe(1);
  });

  it('scatter of points placed symmetrically about a known mean is centred on it', () => {
    // check-values.md #2 point as the centre; points 1 km north and south on the meridian (common practice: symmetric sample).
    const c = { latRad: degToRad(33.3), lonRad: degToRad(44.4), heightM: 6000 };
    const dLat = 1000 / 6371000;
    const a = geodeticToEcef({ ...c, latRad: c.latRad + dLat });
    const b = geodeticToEcef({ ...c, latRad: c.latRad - dLat });
    const s = positionScatter([a, b]);
    expect(s.count).toBe(2);
    // Both lie ~1 km horizontally from the mean (the chord midpoint sits ~0.08 m below the arc: R(1 - cos(1/6371)) = 0.0785 m).
    expect(s.horizontalMedianM).toBeGreaterThan(990);
    expect(s.horizontalMedianM).toBeLessThan(1010);
    expect(s.verticalMedianM).toBeLessThan(0.2);
  });
});

describe('seriesScatter (positions in one Float64Array)', () => {
  it('gives positionScatter\'s figures bit for bit', () => {
    // Check-values #2 (GeographicLib CartConvert manual) as the centre; the spread is arbitrary.
    const c = geodeticToEcef({ latRad: degToRad(33), lonRad: degToRad(44), heightM: 20 });
    const series = new PositionSeries();
    const list = [];
    for (let i = 0; i < 5000; i++) {
      const p = { x: c.x + Math.sin(i * 1.3) * 3, y: c.y + Math.cos(i * 0.7) * 2, z: c.z + ((i * 37) % 101) / 50 };
      series.push(p);
      list.push(p);
    }
    expect(seriesScatter(series)).toEqual(positionScatter(list));
    expect(seriesScatter(new PositionSeries())).toEqual(positionScatter([]));
  });
});

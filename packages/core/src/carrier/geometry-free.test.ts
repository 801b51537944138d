/**
 * The geometry-free slip test on hand-made single differences (hand-checkable): GPS L1 and L2 wavelengths
 * c / 1575.42 MHz and c / 1227.60 MHz (IS-GPS-200 3.3.1.1); a one-cycle slip on L1 moves GF by 0.19 m, on
 * L2 by 0.24 m; one cycle on each, 0.054 m; a change common to all satellites is no slip.
 */
import { describe, expect, it } from 'vitest';
import { GeometryFreeMonitor } from './geometry-free.js';

const L1 = 299792458 / 1575.42e6, L2 = 299792458 / 1227.6e6;

describe('geometry-free slip test on single differences', () => {
  it('a drifting ionosphere (1 mm/s) is no slip; one cycle on L1, on L2, or on both (5.4 cm) at 1 s is', () => {
    const m = new GeometryFreeMonitor(30);
    const gf = (t: number, extra: Record<string, number> = {}) => ['G01', 'G02', 'G03', 'G04'].map((k, i) => ({ key: k, gfM: 0.3 * i + 0.001 * t * (i + 1) + (extra[k] ?? 0) }));
    for (let t = 0; t < 5; t++) expect(m.update(t, gf(t)).size).toBe(0);
    expect([...m.update(5, gf(5, { G01: L1 }))]).toEqual(['G01']);
    expect([...m.update(6, gf(6, { G01: L1, G02: -L2 }))]).toEqual(['G02']);
    expect([...m.update(7, gf(7, { G01: L1, G02: -L2, G03: L1 - L2 }))]).toEqual(['G03']);
  });

  it('a step common to all satellites (one receiver\'s inter-frequency step) is no slip; a new key starts a new series', () => {
    const m = new GeometryFreeMonitor(30);
    const keys = ['G01', 'G02', 'G03'];
    m.update(0, keys.map((key) => ({ key, gfM: 1 })));
    expect(m.update(1, keys.map((key) => ({ key, gfM: 1.5 }))).size).toBe(0);
    expect(m.update(2, [{ key: 'G01:new-arc', gfM: 9 }, { key: 'G02', gfM: 1.5 }, { key: 'G03', gfM: 1.5 }]).size).toBe(0);
  });
});

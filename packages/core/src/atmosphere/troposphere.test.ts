import { describe, expect, it } from 'vitest';
import { niellMapping, saastamoinenZenithHydrostaticM, slantTroposphere, slantTroposphereM, standardAtmosphere } from './troposphere.js';

const DEG = Math.PI / 180;

describe('troposphere', () => {
  it('Saastamoinen/Davis zenith hydrostatic delay', () => {
    // check-values.md #7 (Davis et al. 1985 formula; recomputed): 2.3070 m and 2.2763 m
    expect(saastamoinenZenithHydrostaticM(1013.25, 45 * DEG, 0)).toBeCloseTo(2.307, 4);
    expect(saastamoinenZenithHydrostaticM(1000, 48 * DEG, 200)).toBeCloseTo(2.2763, 4);
  });

  it('standard atmosphere at sea level and 1000 m', () => {
    // Berg 1948: 1013.25 hPa, 288.15 K at h = 0; at 1000 m: 1013.25 (1 - 0.022557)^5.2568 = 898.76 hPa, 281.65 K
    const a0 = standardAtmosphere(0);
    expect(a0.pressureHPa).toBeCloseTo(1013.25, 10);
    expect(a0.temperatureK).toBeCloseTo(288.15, 10);
    // Magnus–Tetens at 15 C: e_s = 17.05 hPa (standard tables list 17.04-17.06 hPa), RH 50 %
    expect(a0.waterVapourHPa).toBeCloseTo(17.05 / 2, 1);
    const a1 = standardAtmosphere(1000);
    expect(a1.pressureHPa).toBeCloseTo(898.76, 1);
    expect(a1.temperatureK).toBeCloseTo(281.65, 10);
  });

  it('Niell mapping is 1 at zenith, grows toward the horizon, about 10 at 5 deg', () => {
    for (const lat of [10, 30, 45, 52, 80, -35]) {
      for (const doy of [1, 100, 200, 300]) {
        const z = niellMapping(lat * DEG, 0, 90 * DEG, doy);
        // Niell 1996 eq. 4 is normalised to 1 at zenith by construction
        expect(Math.abs(z.hydrostatic - 1)).toBeLessThan(1e-3);
        expect(Math.abs(z.wet - 1)).toBeLessThan(1e-3);
        let prev = { hydrostatic: 1, wet: 1 };
        for (let el = 85; el >= 3; el -= 1) {
          const m = niellMapping(lat * DEG, 300, el * DEG, doy);
          expect(m.hydrostatic).toBeGreaterThan(prev.hydrostatic);
          expect(m.wet).toBeGreaterThan(prev.wet);
          prev = m;
        }
      }
    }
    const m5 = niellMapping(45 * DEG, 0, 5 * DEG, 100);
    // ~10.2 hydrostatic at 5 deg, 45 deg latitude (from memory); independent spherical-shell estimate
    // 1 / sqrt(1 - (cos E / (1 + H/R))^2) with H = 8 km hydrostatic scale height gives 9.95 (derived here)
    expect(m5.hydrostatic).toBeGreaterThan(9.9);
    expect(m5.hydrostatic).toBeLessThan(10.4);
    // the wet layer is lower (scale height ~2 km), so its mapping is larger than the hydrostatic one (derived)
    expect(m5.wet).toBeGreaterThan(m5.hydrostatic);
    expect(m5.wet).toBeLessThan(1 / Math.sin(5 * DEG));
  });

  it('zenith total and the differential troposphere between 0 m and 100 m', () => {
    const t0 = slantTroposphere(45 * DEG, 0, 90 * DEG, 180);
    // check-values.md #7: hydrostatic 2.3070 m at 1013.25 hPa, 45 deg, 0 m
    expect(t0.zenithHydrostaticM).toBeCloseTo(2.307, 4);
    // Saastamoinen wet delay at 15 C, 8.5 hPa: 0.002277 (1255/288.15 + 0.05) 8.52 = 0.0855 m (recomputed by hand)
    expect(t0.zenithWetM).toBeCloseTo(0.0855, 3);
    const dz = slantTroposphereM(45 * DEG, 0, 90 * DEG, 180) - slantTroposphereM(45 * DEG, 100, 90 * DEG, 180);
    // derived check: 2.3 m * (1 - exp(-100 / 8000)) = 2.9 cm for an exponential atmosphere with 8 km scale height
    expect(dz).toBeGreaterThan(0.024);
    expect(dz).toBeLessThan(0.034);
    // at 10 deg elevation the difference is roughly the zenith difference times the mapping (~5.5)
    const d10 = slantTroposphereM(45 * DEG, 0, 10 * DEG, 180) - slantTroposphereM(45 * DEG, 100, 10 * DEG, 180);
    expect(d10 / dz).toBeGreaterThan(4.5);
    expect(d10 / dz).toBeLessThan(6.5);
  });
});

describe('slant delay with the receiver parts kept from the last call', () => {
  it('gives the very doubles of slantTroposphere for receivers, days and elevations in turn', () => {
    const receivers = [[0.7, 120], [-0.3, 15], [0.7, 120.5], [1.2, -600], [0, 9500]] as const;
    for (let k = 0; k < 200; k++) {
      const [lat, h] = receivers[k % receivers.length];
      const doy = 1 + (k % 7) * 53.25;
      for (const el of [-0.1, 0.01, 0.2, 0.9, 1.5]) {
        expect(slantTroposphereM(lat, h, el, doy)).toBe(slantTroposphere(lat, h, el, doy).slantM);
      }
    }
  });
});

import { describe, expect, it } from 'vitest';
import { simulateConstellation } from './constellation.js';
import { satelliteState } from '@refdelta/core';
import type { KeplerEphemeris } from '@refdelta/core';

const START = 1_400_000_000;
const nav = simulateConstellation({ seed: 3, startGpsS: START, endGpsS: START + 3600, systems: ['G', 'E'] });
const keps = nav.ephemerides as KeplerEphemeris[];

function stateOf(e: KeplerEphemeris, t: number) {
  const s = satelliteState(e, t);
  const r = s.posM, v = s.velMS;
  return { r: Math.hypot(r.x, r.y, r.z), pos: r, vel: v };
}

describe('simulated constellation (self-consistency with orbit/ and nominal orbits)', () => {
  it('has 27 GPS and 24 Galileo satellites with 2 h / 1 h issues and incrementing IODs', () => {
    const g = new Set(keps.filter((e) => e.system === 'G').map((e) => e.sat));
    const e = new Set(keps.filter((x) => x.system === 'E').map((x) => x.sat));
    expect(g.size).toBe(27);
    expect(e.size).toBe(24);
    const one = keps.filter((x) => x.sat === [...g][0]).sort((a, b) => a.toeGpsS - b.toeGpsS);
    for (let i = 1; i < one.length; i++) {
      expect(one[i]!.toeGpsS - one[i - 1]!.toeGpsS).toBe(7200);
      expect(one[i]!.iode).toBe((one[i - 1]!.iode + 1) % 256);
      expect(one[i]!.fitIntervalH).toBe(4);
    }
    const gal = keps.filter((x) => x.sat === [...e][0]).sort((a, b) => a.toeGpsS - b.toeGpsS);
    expect(gal[1]!.toeGpsS - gal[0]!.toeGpsS).toBe(3600);
    expect(nav.ionosphere.gps).toBeDefined();
  });

  it('orbit radii and inclinations match the nominal constellations', () => {
    for (const e of keps.filter((x) => x.toeGpsS === keps[keps.length - 1]!.toeGpsS || x.system === 'G').slice(0, 80)) {
      const s = stateOf(e, e.toeGpsS + 1234);
      // GPS a = 26,559.7 km, Galileo 29,600 km, near-circular (module comment sources; from memory).
      const aKm = e.system === 'G' ? 26_559.7 : 29_600;
      expect(Math.abs(s.r / 1000 - aKm)).toBeLessThan(aKm * 0.016 + 1);
      // Inclination from the angular momentum direction (inertial velocity = ECEF velocity + omega x r).
      const we = 7.2921151467e-5;
      const vx = s.vel.x - we * s.pos.y, vy = s.vel.y + we * s.pos.x, vz = s.vel.z;
      const hx = s.pos.y * vz - s.pos.z * vy, hy = s.pos.z * vx - s.pos.x * vz, hz = s.pos.x * vy - s.pos.y * vx;
      const incDeg = (Math.acos(hz / Math.hypot(hx, hy, hz)) * 180) / Math.PI;
      expect(Math.abs(incDeg - (e.system === 'G' ? 55 : 56))).toBeLessThan(2);
    }
  });

  it('consecutive issues describe the same orbit and clock (continuous at the switch to < 1 mm / 1 ps)', () => {
    const bySat = new Map<string, KeplerEphemeris[]>();
    for (const e of keps) (bySat.get(e.sat) ?? bySat.set(e.sat, []).get(e.sat)!).push(e);
    for (const list of bySat.values()) {
      for (let i = 1; i < list.length; i++) {
        const a = list[i - 1]!, b = list[i]!;
        const t = (a.toeGpsS + b.toeGpsS) / 2;
        const pa = satelliteState(a, t).posM, pb = satelliteState(b, t).posM;
        expect(Math.hypot(pa.x - pb.x, pa.y - pb.y, pa.z - pb.z)).toBeLessThan(0.001);
        const ca = a.af0 + a.af1 * (t - a.tocGpsS), cb = b.af0 + b.af1 * (t - b.tocGpsS);
        expect(Math.abs(ca - cb)).toBeLessThan(1e-12);
      }
    }
  });

  it('a mid-latitude site sees a plausible number of satellites above 5 deg', () => {
    // 47 N 8 E on the ellipsoid; about 8-12 GPS and 6-10 Galileo satellites are usually in view (common practice).
    const lat = (47 * Math.PI) / 180, lon = (8 * Math.PI) / 180;
    const N = 6378137 / Math.sqrt(1 - 0.00669438 * Math.sin(lat) ** 2);
    const rx = { x: N * Math.cos(lat) * Math.cos(lon), y: N * Math.cos(lat) * Math.sin(lon), z: N * (1 - 0.00669438) * Math.sin(lat) };
    const up = { x: Math.cos(lat) * Math.cos(lon), y: Math.cos(lat) * Math.sin(lon), z: Math.sin(lat) };
    for (const t of [START, START + 1800, START + 3600]) {
      const count = { G: 0, E: 0 };
      const seen = new Set<string>();
      for (const e of keps) {
        if (seen.has(e.sat) || Math.abs(e.toeGpsS - t) > 3600) continue;
        seen.add(e.sat);
        const p = satelliteState(e, t).posM;
        const d = { x: p.x - rx.x, y: p.y - rx.y, z: p.z - rx.z };
        const sinEl = (d.x * up.x + d.y * up.y + d.z * up.z) / Math.hypot(d.x, d.y, d.z);
        if (sinEl > Math.sin((5 * Math.PI) / 180)) count[e.system as 'G' | 'E']++;
      }
      expect(count.G).toBeGreaterThanOrEqual(5);
      expect(count.G).toBeLessThanOrEqual(14);
      expect(count.E).toBeGreaterThanOrEqual(4);
      expect(count.E).toBeLessThanOrEqual(13);
    }
  });
});

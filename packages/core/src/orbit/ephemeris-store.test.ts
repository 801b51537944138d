import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import type { Ephemeris, GlonassEphemeris, KeplerEphemeris, NavData } from '../gnss/nav-types.js';
import { EphemerisStore, issueKey } from './ephemeris-store.js';

// Records transcribed from glw1277m.18n / glw1277m.18g and BRDC00IGS_R_20240100000_01D_MN.rnx.gz.
const REC = JSON.parse(readFileSync(new URL('./broadcast-records.test-data.json', import.meta.url), 'utf8'),
  (_k, v) => (v === 'NaN' ? NaN : v)) as Record<string, Ephemeris>;
const G12 = REC['gps-G03-12h'] as KeplerEphemeris;
const G14 = REC['gps-G03-14h'] as KeplerEphemeris;
const R1215 = REC['glo-R07-1215'] as GlonassEphemeris;
const R1245 = REC['glo-R07-1245'] as GlonassEphemeris;

const nav = (ephemerides: Ephemeris[], file = 'x.nav'): NavData =>
  ({ files: [file], version: 2.1, ephemerides, ionosphere: {}, leapSeconds: 18 });

describe('EphemerisStore selection', () => {
  const store = new EphemerisStore(nav(Object.values(REC)));

  it('takes the issue whose toe is nearest (GPS, fit interval flag 0 = 4 h: IS-GPS-200 20.3.4.4)', () => {
    expect(store.select('G03', G12.toeGpsS + 50 * 60).eph).toBe(G12);
    expect(store.select('G03', G12.toeGpsS + 70 * 60).eph).toBe(G14); // 14:00 issue transmitted 11:59
    expect(store.select('G03', G14.toeGpsS + 2 * 3600 + 200).eph).toBe(G14); // within 2 h + 300 s margin
  });

  it('reports too-old with the age beyond the fit interval, no-ephemeris for an unknown satellite', () => {
    const s = store.select('G03', G14.toeGpsS + 3 * 3600);
    expect(s.eph).toBeNull();
    expect(s.reason).toBe('too-old');
    expect(s.ageS).toBe(3 * 3600);
    expect(store.select('G31', G12.toeGpsS).reason).toBe('no-ephemeris');
  });

  it('prefers an issue already transmitted at t when the transmission time is known', () => {
    const late: KeplerEphemeris = { ...G14, transmitGpsS: G12.toeGpsS + 90 * 60 };
    const st = EphemerisStore.fromEphemerides([G12, late]);
    expect(st.select('G03', G12.toeGpsS + 65 * 60).eph).toBe(G12);
    expect(st.select('G03', G12.toeGpsS + 95 * 60).eph).toBe(late);
  });

  it('skips unhealthy records and says so when only unhealthy ones are valid', () => {
    const sick: KeplerEphemeris = { ...G14, health: 1 };
    const st = EphemerisStore.fromEphemerides([G12, sick]);
    expect(st.select('G03', G12.toeGpsS + 100 * 60).eph).toBe(G12);
    const only = EphemerisStore.fromEphemerides([sick]);
    expect(only.select('G03', sick.toeGpsS).reason).toBe('unhealthy');
    expect(only.select('G03', sick.toeGpsS, { allowUnhealthy: true }).eph).toBe(sick);
  });

  it('handles a week crossing: toe at 604784 s of the week, t 10 s into the next week', () => {
    const week = 2021;
    const eph: KeplerEphemeris = { ...G12, toeSowS: 604_784, toeGpsS: week * 604_800 + 604_784, tocGpsS: week * 604_800 + 604_784, transmitGpsS: NaN };
    const s = EphemerisStore.fromEphemerides([eph]).select('G03', (week + 1) * 604_800 + 10);
    expect(s.eph).toBe(eph);
    expect(s.ageS).toBe(26); // IS-GPS-200 20.3.3.4.3: tk = 10 - 604784 + 604800
  });

  it('removes duplicates from merged files, keeps distinct issues', () => {
    const merged = new EphemerisStore([nav([G12, G14, R1215], 'a.nav'), nav([{ ...G12 }, R1245, { ...R1215 }], 'b.nav')]);
    expect(merged.duplicatesRemoved).toBe(2);
    expect(merged.ephemerides('G03')).toHaveLength(2);
    expect(merged.ephemerides('R07')).toHaveLength(2);
    expect(merged.satellites()).toEqual(['G03', 'R07']);
    expect([...merged.systemsWithEphemeris()].sort()).toEqual(['G', 'R']);
    expect(merged.byIssueKey(issueKey(G14))).toBe(G14);
    expect(issueKey(G12)).toBe(`G03:${G12.toeGpsS}:66`);
  });

  it('GLONASS: valid 15 min around t_b plus the 5 min margin (GLONASS ICD A.3.1.2), channel from the record', () => {
    const st = EphemerisStore.fromEphemerides([R1215]);
    expect(st.select('R07', R1215.tbGpsS - 19 * 60).eph).toBe(R1215);
    const old = st.select('R07', R1215.tbGpsS + 21 * 60);
    expect(old.reason).toBe('too-old');
    expect(old.ageS).toBe(21 * 60);
    expect(store.select('R07', R1215.tbGpsS + 16 * 60).eph).toBe(R1245);
    expect(store.glonassChannels().get(7)).toBe(5); // glw1277m.18g line 94: frequency number 5
  });

  it('BeiDou: 1 h window; Galileo: I/NAV preferred, F/NAV on request, distinct issue keys', () => {
    const c = REC['bds-C23-meo-00h'] as KeplerEphemeris;
    expect(store.select('C23', c.toeGpsS - 3600).eph).toBe(c);
    expect(store.select('C23', c.toeGpsS - 3600 - 400).reason).toBe('too-old');
    const inav = REC['gal-E11-inav-1000'];
    const fnav = REC['gal-E11-fnav-1000'];
    expect(store.select('E11', inav.kind === 'kepler' ? inav.toeGpsS + 60 : 0).eph).toBe(inav);
    expect(store.select('E11', inav.kind === 'kepler' ? inav.toeGpsS + 60 : 0, { galileoClock: 'FNAV' }).eph).toBe(fnav);
    expect(issueKey(inav)).not.toBe(issueKey(fnav));
  });
});

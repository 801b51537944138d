/**
 * The bundled demo: an invented survey in an invented town (Kestrelford), nothing real. A geodetic
 * reference on the invented control mark KFRD logs GPS + Galileo at 5 s (dual-frequency GPS, CORS-like);
 * a low-cost single-frequency rover on a pole visits four invented points about 1.5 km away, logging at
 * 1 s, walking between them. Every error switch is on. The coordinates were picked arbitrarily: no real
 * mark, place or person is meant.
 *
 * renderDemoFiles() gives every file's text as chunks; fixtures/demo/make-demo.mjs writes them atomically and
 * the demo test hashes them, so the committed files are exactly what the seed produces.
 */
import type { EcefM } from '@refdelta/core';
import { ecefToGeodetic } from '@refdelta/core';
import { isoFromSeconds, secondsFromCalendar, weekTowFromGpsS } from '@refdelta/core';
import { writeObsRinex3 } from '@refdelta/core';
import { writeNavRinex3 } from '@refdelta/core';
import { ALL_ERRORS_ON } from './errors.js';
import { simulateScenario, type ScenarioSpec, type SimulatedScenario } from './scenario.js';

export interface DemoFile {
  readonly name: string;
  chunks(): Iterable<string>;
}

export const DEMO_FILE_NAMES = [
  'KFRD-reference-5s.obs', 'rover-1s.obs', 'broadcast-mixed.nav', 'rover-truth.csv', 'points.csv', 'control-marks.csv', 'occupations.csv',
] as const;

/** The demo scenario (seed 20240514). */
export function demoScenarioSpec(): ScenarioSpec {
  return {
    seed: 20240514,
    startGpsS: secondsFromCalendar({ year: 2024, month: 5, day: 14, hour: 9, minute: 30, second: 0 }),
    durationS: 1800,
    reference: {
      markGeodetic: { latDeg: 47.123456, lonDeg: 8.765432, heightM: 412.345 },
      antennaHeightM: 0.08,
      markerName: 'KFRD',
      markerNumber: 'KF-CM-0001',
      intervalS: 5,
      receiverType: 'SIM GEODETIC L1L2',
      antennaType: 'SIMCHOKE        NONE',
      dualFrequency: true,
    },
    rover: {
      intervalS: 1,
      startOffsetS: 180,
      receiverType: 'SIM LOWCOST L1',
      antennaType: 'SIMPATCH        NONE',
      markerNumber: 'KF-SURVEY-24',
      plan: [
        { kind: 'static', point: 'MILLSTONE', durationS: 240, antennaHeightM: 1.8 },
        { kind: 'walk', to: 'FERRYPOST', speedMS: 1.2 },
        { kind: 'static', point: 'FERRYPOST', durationS: 240, antennaHeightM: 2.0 },
        { kind: 'walk', to: 'ELMCORNER', speedMS: 1.2 },
        { kind: 'static', point: 'ELMCORNER', durationS: 180, antennaHeightM: 1.5 },
        { kind: 'walk', to: 'WELLHEAD', speedMS: 1.2 },
        { kind: 'static', point: 'WELLHEAD', durationS: 180, antennaHeightM: 1.65 },
      ],
    },
    points: {
      MILLSTONE: { e: 1203.412, n: 851.077, u: -4.236 },
      FERRYPOST: { e: 1391.958, n: 702.314, u: -6.815 },
      ELMCORNER: { e: 1308.227, n: 963.582, u: -2.104 },
      WELLHEAD: { e: 1151.603, n: 1004.449, u: 1.312 },
    },
    systems: ['G', 'E'],
    // Every switch on; faults a little more often than the default so the short demo has some to find.
    errors: { ...ALL_ERRORS_ON, faults: { perHour: 6 } },
    comments: ['Invented demo (Kestrelford): see fixtures/demo/README.md'],
  };
}

/** The demo's creation date in file headers: fixed, so regeneration is byte-identical. */
const DEMO_DATE_TEXT = '20240514 120000 UTC';
const PROGRAM = 'refdelta sim';

const f4 = (v: number) => v.toFixed(4);
const f9 = (v: number) => v.toFixed(9);
const deg = (r: number) => (r * 180) / Math.PI;

function geodeticText(p: EcefM): [string, string, string] {
  const g = ecefToGeodetic(p);
  return [f9(deg(g.latRad)), f9(deg(g.lonRad)), f4(g.heightM)];
}

/** Control marks "as published": KFRD, MILLSTONE and ELMCORNER true; WELLHEAD deliberately 3 cm north of the truth. */
export const DEMO_WELLHEAD_PUBLISHED_OFFSET_NORTH_M = 0.03;

function* lines(rows: readonly string[]): Iterable<string> {
  for (const r of rows) yield r + '\n';
}

export function renderDemoFiles(sim: SimulatedScenario = simulateScenario(demoScenarioSpec())): DemoFile[] {
  const t = sim.truth;
  const frameText = `${t.frame.name} at epoch ${t.frame.epochYear.toFixed(4)}`;
  const head = (what: string) => [`# ${what}`, '# SIMULATED: invented demo (Kestrelford), not a real survey.', `# Frame: ${frameText}; times GPS (GPST).`];
  const files: DemoFile[] = [
    { name: 'KFRD-reference-5s.obs', chunks: () => writeObsRinex3(sim.referenceHeader, sim.referenceEpochs(), { version: 3.04, program: PROGRAM, dateText: DEMO_DATE_TEXT }) },
    { name: 'rover-1s.obs', chunks: () => writeObsRinex3(sim.roverHeader, sim.roverEpochs(), { version: 3.04, program: PROGRAM, dateText: DEMO_DATE_TEXT }) },
    {
      name: 'broadcast-mixed.nav',
      chunks: () => writeNavRinex3(sim.nav, { program: PROGRAM, runBy: '', date: DEMO_DATE_TEXT, comments: ['SIMULATED broadcast ephemerides (refdelta sim)', `Orbits in ${frameText}`] }),
    },
    {
      name: 'rover-truth.csv',
      *chunks() {
        yield* lines([...head('True rover antenna reference point (ARP) at each rover epoch; the position is at the true reception instant (the tag minus the receiver clock offset, < 1 ms: < 1 mm walking).'), 'gps_week,gps_tow_s,x_m,y_m,z_m,point']);
        for (const e of sim.roverEpochs()) {
          if (e.flag !== 0) continue;
          const p = t.roverAt(t.roverTrueTime(e.tagGpsS));
          const wt = weekTowFromGpsS(e.tagGpsS);
          const occ = t.occupationAt(e.tagGpsS);
          yield `${wt.week},${wt.towS.toFixed(3)},${f4(p.x)},${f4(p.y)},${f4(p.z)},${occ === null ? 'moving' : occ.name}\n`;
        }
      },
    },
    {
      name: 'points.csv',
      chunks: () => lines([
        ...head('True marks (ECEF and geodetic) and antenna heights (ARP above mark); role reference or rover.'),
        'name,role,x_m,y_m,z_m,lat_deg,lon_deg,h_m,antenna_height_m',
        [ 'KFRD', 'reference', f4(t.referenceMark.x), f4(t.referenceMark.y), f4(t.referenceMark.z), ...geodeticText(t.referenceMark), f4(sim.referenceHeader.antennaOffset.heightM)].join(','),
        ...t.points.map((o) => [o.name, 'rover', f4(o.markEcef.x), f4(o.markEcef.y), f4(o.markEcef.z), ...geodeticText(o.markEcef), f4(o.antennaHeightM)].join(',')),
      ]),
    },
    {
      name: 'control-marks.csv',
      chunks: () => {
        const epoch = t.frame.epochYear.toFixed(4);
        const row = (name: string, p: EcefM, dNorthM: number) => {
          const g = ecefToGeodetic(p);
          const latDeg = deg(g.latRad) + deg(dNorthM / 6_367_000); // 3 cm north: about 2.7e-7 deg (spherical radius: common practice)
          return [name, f9(latDeg), f9(deg(g.lonRad)), f4(g.heightM), t.frame.name, epoch, '0.010', '0.020'].join(',');
        };
        const mark = (n: string) => t.marks.get(n)!;
        return lines([
          ...head('Invented "published" control marks. WELLHEAD is published 3 cm north of its true position (a deliberate blunder to be found).'),
          'name,lat_deg,lon_deg,h_m,frame,epoch,accuracy_h_m,accuracy_v_m',
          row('KFRD', t.referenceMark, 0),
          row('MILLSTONE', mark('MILLSTONE'), 0),
          row('ELMCORNER', mark('ELMCORNER'), 0),
          row('WELLHEAD', mark('WELLHEAD'), DEMO_WELLHEAD_PUBLISHED_OFFSET_NORTH_M),
        ]);
      },
    },
    {
      name: 'occupations.csv',
      chunks: () => lines([
        ...head('Rover static occupations (GPS time, ISO 8601) and antenna heights.'),
        'name,start,end,antenna_height_m',
        ...t.points.map((o) => `${o.name},${isoFromSeconds(o.startGpsS, ' GPST')},${isoFromSeconds(o.endGpsS, ' GPST')},${f4(o.antennaHeightM)}`),
      ]),
    },
  ];
  return files;
}

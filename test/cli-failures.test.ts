/**
 * Every failure of `refdelta` ends with a documented exit code (1 processing, 2 usage; README.md) and ONE
 * sentence on stderr, no stack trace unless --debug. Inputs are real files from ../shared.
 */
import { beforeAll, describe, expect, it } from 'vitest';
import { dataPath, describeShared, sharedPath } from './support/shared.js';
import { expectOneSentence, requireBuiltCli, runCli, tempDir } from './cli-support.js';

beforeAll(requireBuiltCli);

describe('usage errors (exit 2), checked before any file is read', () => {
  const base = ['solve', '--rover', 'r.obs', '--reference', 'b.obs', '--nav', 'n.nav', '--out', 'x'];
  const cases: [string, string[], RegExp][] = [
    ['no command', [], /give a command/],
    ['unknown option', [...base, '--ref-coord', 'header', '--no-such-option'], /unknown option --no-such-option/],
    ['missing --rover', ['solve', '--reference', 'b.obs', '--nav', 'n', '--out', 'x', '--ref-coord', 'header'], /rover/],
    ['no reference coordinate', base, /--ref-coord: X,Y,Z.*LAT,LON,H.*mark name.*'header'/],
    ['a reference coordinate of no known form names the forms', [...base, '--ref-coord', 'KFRD;X'], /matches none of its forms: X,Y,Z \(ECEF metres.*LAT,LON,H.*a mark name from --marks FILE.*'header'/],
    ['a mark name without a marks file', [...base, '--ref-coord', 'KFRD'], /no --marks FILE/],
    ['coordinate without frame', [...base, '--ref-coord', '3774089.2,-601661.6,5089321.2'], /--ref-frame.*--ref-epoch/],
    ['coordinate with two values', [...base, '--ref-coord', '1,2', '--ref-frame', 'WGS84', '--ref-epoch', '2018.76'], /expected three/],
    ['coordinate inside the Earth', [...base, '--ref-coord', '1000,2000,300000', '--ref-frame', 'WGS84', '--ref-epoch', '2018.76'], /near the Earth's surface/],
    ['latitude out of range', [...base, '--ref-coord', '95,10,100', '--ref-frame', 'ITRF2014', '--ref-epoch', '2018.76'], /latitude\/longitude\/height within -90..90/],
    ['a negative coordinate value is read as a value, not as a flag', [...base, '--ref-coord', '-95,-10,100', '--ref-frame', 'ITRF2014', '--ref-epoch', '2018.76'], /within -90..90/],
    ['a misspelt frame name is refused without --allow-unknown-frame', [...base, '--ref-coord', '53,-9,70', '--ref-frame', 'ETRF2OOO', '--ref-epoch', '2018.76'], /'ETRF2OOO' is not a frame refdelta knows.*--allow-unknown-frame/],
    ['elevation mask out of range', [...base, '--ref-coord', 'header', '--elevation-mask', '95'], /--elevation-mask must be between 0 and 90/],
    ['elevation mask not a number', [...base, '--ref-coord', 'header', '--elevation-mask', 'ten'], /--elevation-mask expects a number/],
    ['unknown system letter', [...base, '--ref-coord', 'header', '--systems', 'G,X'], /--systems/],
    ['unknown weighting', [...base, '--ref-coord', 'header', '--weights', 'snr'], /--weights expects one of/],
    ['slant height without radius', [...base, '--ref-coord', 'header', '--rover-antenna-height', '1.5', '--height-kind', 'slant'], /--antenna-radius/],
    ['unknown output', [...base, '--ref-coord', 'header', '--outputs', 'epochs,shapefile'], /--outputs/],
    ['epoch out of range', [...base, '--ref-coord', '53,-9,70', '--ref-frame', 'ITRF2014', '--ref-epoch', '18.76'], /--ref-epoch must be between/],
  ];
  for (const [name, args, re] of cases) {
    it(name, () => {
      const r = runCli(args);
      expect(r.status).toBe(2);
      expect(expectOneSentence(r)).toMatch(re);
    });
  }

  it('a missing input file is one sentence, exit 1', () => {
    const r = runCli([...base, '--ref-coord', 'header']);
    expect(r.status).toBe(1);
    expect(expectOneSentence(r)).toMatch(/file not found: r\.obs/);
  });
});

const D = 'cors-and-rover-2018-277';

describeShared('processing failures on real files (exit 1, one sentence)', () => {
  const rover = dataPath(`${D}/static-run/rover.obs`);
  const base = dataPath(`${D}/static-run/base.obs`);
  const nav = dataPath(`${D}/reference/glw1277m.18n`);
  const solve = (r: string, ref: string, n: string, extra: string[] = []) =>
    runCli(['solve', '--rover', r, '--reference', ref, '--nav', n, '--ref-coord', 'header', '--out', tempDir('rd-fail-'), ...extra]);

  it('a file that is not RINEX', () => {
    const r = solve(dataPath('README.md'), base, nav);
    expect(r.status).toBe(1);
    expect(expectOneSentence(r)).toMatch(/is not a RINEX file/);
  });

  it('a navigation file given as observations', () => {
    const r = solve(nav, base, nav);
    expect(r.status).toBe(1);
    expect(expectOneSentence(r)).toMatch(/navigation file, not an observation file/);
  });

  it('files that do not overlap in time (12:37-12:58 rover, 14:00-14:59 reference: data README)', () => {
    const r = solve(rover, dataPath(`${D}/reference/glw1277o.18o`), nav);
    expect(r.status).toBe(1);
    expect(expectOneSentence(r)).toMatch(/do not overlap in time/);
  });

  it('no navigation data for the satellites observed (a Galileo-only nav file of another day: data README)', () => {
    const r = solve(rover, base, dataPath('single-station/CEDA00USA_R_20182100000_01D_MN.rnx.gz'));
    expect(r.status).toBe(1);
    expect(expectOneSentence(r)).toMatch(/no navigation data for the satellites observed/);
  });

  it('--json-lines reports the failure as a JSON event on stdout too', () => {
    const r = solve(nav, base, nav, ['--json-lines']);
    expect(r.status).toBe(1);
    const events = r.stdout.split('\n').filter(Boolean).map((l) => JSON.parse(l));
    const err = events.find((e) => e.event === 'error');
    expect(err.exit_code).toBe(1);
    expect(err.message).toMatch(/not an observation file/);
  });

  it('--debug adds the stack trace', () => {
    const r = solve(nav, base, nav, ['--debug']);
    expect(r.status).toBe(1);
    expect(r.stderr).toMatch(/\n\s+at /);
  });

  it('inspect of the damaged compact RINEX lists the problems with line numbers and does not crash', () => {
    const r = runCli(['inspect', sharedPath('bad-input/hubu00DEU_R_20230931500_01H_30S_MO.crx')]);
    expect(r.status).toBe(0);
    const j = JSON.parse(r.stdout);
    expect(j.kind).toBe('observation');
    expect(j.problems.count).toBeGreaterThan(0); // data README: the file is damaged somewhere
    expect(j.problems.list[0].line).toBeGreaterThan(0);
    expect(j.epochs.observation).toBeGreaterThan(0); // what was read before the damage is kept
  });
});

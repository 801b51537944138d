/**
 * Failure sentences that name what is wrong: damaged navigation vs. time overlap, rover header damage,
 * files without a readable epoch, damaged compression headers, over-long lines. Inputs: the invented
 * demo files (fixtures/demo) damaged on purpose; the contract is our own (one sentence, exit 1).
 */
import { beforeAll, describe, expect, it } from 'vitest';
import { readFileSync, writeFileSync } from 'node:fs';
import { gzipSync } from 'node:zlib';
import { join } from 'node:path';
import { REPO_ROOT } from './support/shared.js';
import { expectOneSentence, requireBuiltCli, runCli, tempDir } from './cli-support.js';

beforeAll(requireBuiltCli);

const demo = (f: string) => join(REPO_ROOT, 'fixtures/demo', f);
const text = (f: string) => readFileSync(demo(f), 'latin1');
const solve = (rover: string, ref: string, nav: string) => runCli(['solve', '--rover', rover, '--reference', ref, '--nav', nav,
  '--ref-coord', 'KFRD', '--marks', demo('control-marks.csv'), '--outputs', 'summary', '--quiet', '--out', tempDir('rd-sent-out-')]);
const put = (name: string, body: string | Uint8Array): string => {
  const p = join(tempDir('rd-sent-'), name);
  writeFileSync(p, body, typeof body === 'string' ? 'latin1' : undefined);
  return p;
};

describe('sentences that name the real problem (demo files, damaged on purpose)', () => {
  it('navigation records that are all unusable are named, not called a time overlap', () => {
    // SV health (BROADCAST ORBIT 6, second D19.12 field; RINEX 3.04 table A6) set to 1 in every record
    const lines = text('broadcast-mixed.nav').split('\n');
    const end = lines.findIndex((l) => l.includes('END OF HEADER'));
    let start = -1;
    for (let i = end + 1; i < lines.length; i++) {
      if (/^[A-Z]/.test(lines[i])) start = i;
      if (start >= 0 && i - start === 6) lines[i] = lines[i].slice(0, 23) + ' 1.000000000000E+00' + lines[i].slice(42);
    }
    const r = solve(demo('rover-1s.obs'), demo('KFRD-reference-5s.obs'), put('unhealthy.nav', lines.join('\n')));
    expect(r.status).toBe(1);
    const s = expectOneSentence(r);
    expect(s).not.toMatch(/do not overlap/);
    expect(s).toMatch(/navigation files .*unhealthy\.nav hold no usable ephemeris/);
  });

  it('a rover header without readable observation types is blamed on the rover header', () => {
    const rover = put('r.obs', text('rover-1s.obs').replace(/^G    4 C1C/m, 'X    4 C1C').replace(/^E    4 C1C/m, 'Y    4 C1C'));
    const s = expectOneSentence(solve(rover, demo('KFRD-reference-5s.obs'), demo('broadcast-mixed.nav')));
    expect(s).toMatch(/header of .*r\.obs gives no observation types/);
  });

  it('a rover without a readable epoch says so with its first problem (file and line)', () => {
    const rover = put('r.obs', text('rover-1s.obs').replace(/^> 2024/gm, '? 2024'));
    const s = expectOneSentence(solve(rover, demo('KFRD-reference-5s.obs'), demo('broadcast-mixed.nav')));
    expect(s).toMatch(/r\.obs holds no readable observation epoch; first problem: .*r\.obs:\d+:/);
  });

  it('a reference without a readable epoch says so', () => {
    const ref = put('b.obs', text('KFRD-reference-5s.obs').replace(/^> 2024/gm, '? 2024'));
    const s = expectOneSentence(solve(demo('rover-1s.obs'), ref, demo('broadcast-mixed.nav')));
    expect(s).toMatch(/reference file .*b\.obs (holds|gave) no readable observation epoch/);
  });

  it('a gzip file with a damaged header is called damaged, not empty or not RINEX', () => {
    const gz = gzipSync(Buffer.from(text('rover-1s.obs').slice(0, 20000), 'latin1'));
    gz[3] = 0xe0; // FLG reserved bits set (RFC 1952 2.3.1: must be zero)
    const s = expectOneSentence(solve(put('r.obs.gz', gz), demo('KFRD-reference-5s.obs'), demo('broadcast-mixed.nav')));
    expect(s).toMatch(/r\.obs\.gz: the gzip layer is damaged from its first bytes/);
  });

  it('an over-long line names the file, the line and the limit', () => {
    const t = text('rover-1s.obs').split('\n');
    t.splice(30, 0, 'x'.repeat(3 << 20));
    const s = expectOneSentence(solve(put('r.obs', t.join('\n')), demo('KFRD-reference-5s.obs'), demo('broadcast-mixed.nav')));
    expect(s).toMatch(/r\.obs.* line 31 is longer than 1,048,576 characters/);
  });
});

describe('geoid grids checked before the run (fixtures/geo/egm96-crop.isg, EGM96 nodes far from the demo)', () => {
  it('a grid that does not cover the survey area is one sentence before any epoch is solved', () => {
    const r = runCli(['points', '--rover', demo('rover-1s.obs'), '--reference', demo('KFRD-reference-5s.obs'), '--nav', demo('broadcast-mixed.nav'),
      '--ref-coord', 'KFRD', '--marks', demo('control-marks.csv'), '--geoid', join(REPO_ROOT, 'fixtures/geo/egm96-crop.isg'), '--out', tempDir('rd-geoid-')]);
    expect(r.status).toBe(1);
    expect(r.stderr).not.toMatch(/rover epochs/);
    expect(expectOneSentence({ ...r, stderr: r.stderr.split('\n').filter((l) => !l.startsWith('warning') && !l.startsWith('note')).join('\n') }))
      .toMatch(/geoid grid .*egm96-crop\.isg does not cover the survey area/);
  });
});

/**
 * --antennas: an ANTEX file read plain or compressed (carrier-run.ts readAntexFile), and the antenna
 * warnings of a run given one: the file name said once, the missing antenna and the ANTEX file named.
 */
import { describe, expect, it } from 'vitest';
import { readAntex } from '@refdelta/core';
import { readFileSync } from 'node:fs';
import { gunzipSync } from 'node:zlib';
import { readAntexFile } from '../packages/cli/src/carrier-run.js';
import { dataPath, describeShared } from './support/shared.js';
import { requireBuiltCli, runCli, tempDir } from './cli-support.js';

const SR = 'cors-and-rover-2018-277/static-run';
const NAV = ['cors-and-rover-2018-277/reference/glw1277m.18n', 'cors-and-rover-2018-277/reference/glw1277m.18g'].map(dataPath);
const ANTEX = dataPath('antex/igs20-small.atx');

describeShared('readAntexFile', () => {
  it('reads a gzip ANTEX file as its text unpacked by node:zlib reads', async () => {
    const path = dataPath('antex/igs14_small.atx.gz');
    const gz = await readAntexFile(path, () => {});
    const plain = readAntex(path, gunzipSync(readFileSync(path)).toString('latin1'));
    expect(gz.antennas.size).toBeGreaterThan(0);
    expect([...gz.antennas.keys()]).toEqual([...plain.antennas.keys()]);
    expect(gz).toEqual(plain);
  });

  it('reads a plain ANTEX file', async () => {
    const path = dataPath('antex/igs20-small.atx');
    expect(await readAntexFile(path, () => {})).toEqual(readAntex(path, readFileSync(path, 'latin1')));
  });
});

describeShared('the antenna warnings of a run given an ANTEX file (real static run; igs20-small.atx holds neither receiver\'s antenna)', () => {
  it('the observation file is named once (as the warning\'s file), the ANTEX file and the antennas it lacks are named, no advice to give --antennas', () => {
    requireBuiltCli();
    const out = tempDir('rd-antex-words-');
    const r = runCli(['solve', '--rover', dataPath(`${SR}/rover.obs`), '--reference', dataPath(`${SR}/base.obs`), '--nav', ...NAV,
      '--ref-coord', '3774089.2120,-601661.6157,5089321.2474', '--ref-frame', 'WGS84', '--ref-epoch', '2018.76', '--antennas', ANTEX, '--outputs', 'summary', '--out', out]);
    expect(r.status, r.stderr).toBe(0);
    const lines = r.stderr.split('\n').filter((l) => l.includes('is not in'));
    expect(lines.length).toBeGreaterThan(0);
    for (const l of lines) {
      const file = l.match(/^warning: (\S+?): /)?.[1];
      expect(file, l).toBeDefined();
      expect(l.split(file!).length - 1, l).toBe(1);
      expect(l).toContain(`is not in ${ANTEX}`);
      expect(l).not.toContain('give --antennas');
    }
  });
});

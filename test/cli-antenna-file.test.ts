/**
 * --antennas: an ANTEX file read plain or compressed (carrier-run.ts readAntexFile), and the antenna
 * warnings of a run given one: the file name said once, the missing antenna and the ANTEX file named.
 */
import { describe, expect, it } from 'vitest';
import { readAntex } from '@refdelta/core';
import { readFileSync } from 'node:fs';
import { gunzipSync } from 'node:zlib';
import { AntennaWarningWords, readAntexFile } from '../packages/cli/src/carrier-run.js';
import { dataPath, describeShared } from './support/shared.js';

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

describe('AntennaWarningWords', () => {
  const antex = { file: 'cal.atx', antennas: new Map() };
  const words = new AntennaWarningWords('cal.atx', antex, ['PATCH ANTENNA', 'LEIAR10         NONE']);

  it('says the file name once and names the ANTEX file', () => {
    const w = words.warning({ file: 'r.obs', code: 'antenna-not-calibrated', message: "r.obs: antenna type 'PATCH ANTENNA' is not in the antenna calibrations given: its phase-centre offset and variation are not applied" });
    expect(w.message).toBe("antenna type 'PATCH ANTENNA' is not in cal.atx: its phase-centre offset and variation are not applied");
    expect(w.file).toBe('r.obs');
  });

  it('replaces the advice to give --antennas with the antennas the file lacks', () => {
    const w = words.warning({ file: 'r.obs', code: 'antenna-types-differ', message: "the antennas differ (rover 'PATCH ANTENNA', reference 'LEIAR10         NONE') and no calibration is applied to both: x; give --antennas with an ANTEX file" });
    expect(w.message).toBe("the antennas differ (rover 'PATCH ANTENNA', reference 'LEIAR10         NONE') and no calibration is applied to both: x; the antennas 'PATCH ANTENNA' and 'LEIAR10         NONE' are not in cal.atx");
  });

  it('leaves other warnings alone', () => {
    const w = { file: 'r.obs', code: 'bad-epoch-skipped', message: 'r.obs: x' };
    expect(words.warning(w)).toBe(w);
  });
});

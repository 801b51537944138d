/**
 * A reference coordinate given for a reference file whose header has no position (APPROX POSITION XYZ
 * zero): the station's own single-receiver position is the comparison (demo files, simulated: a
 * self-consistency test). KFRD is at 47.123456, 8.765432, 412.345 m (fixtures/demo/control-marks.csv).
 */
import { readFileSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { beforeAll, describe, expect, it } from 'vitest';
import { fixturePath } from './support/shared.js';
import { requireBuiltCli, runCli, tempDir } from './cli-support.js';

const DEMO = (f: string) => fixturePath(`demo/${f}`);

describe('reference coordinate against a reference file without a header position (demo, self-consistency)', () => {
  let reference = '';
  beforeAll(() => {
    requireBuiltCli();
    const text = readFileSync(DEMO('KFRD-reference-5s.obs'), 'latin1')
      .replace(/^.{60}APPROX POSITION XYZ/m, `${'        0.0000        0.0000        0.0000'.padEnd(60)}APPROX POSITION XYZ`);
    expect(text).toMatch(/^ +0\.0000 +0\.0000 +0\.0000 +APPROX POSITION XYZ/m);
    reference = join(tempDir('rd-refpos-demo-'), 'KFRD-no-position.obs');
    writeFileSync(reference, text, 'latin1');
  });
  const run = (coord: string, out: string) => runCli(['solve', '--rover', DEMO('rover-1s.obs'), '--reference', reference, '--nav', DEMO('broadcast-mixed.nav'),
    '--ref-coord', coord, '--ref-frame', 'WGS84', '--ref-epoch', '2024.3672', '--carrier-phase', 'off', '--outputs', 'summary', '--out', out]);

  it('the mark\'s own coordinate: no warning about it', () => {
    const r = run('47.123456,8.765432,412.345', tempDir('rd-refpos-demo-ok-'));
    expect(r.status, r.stderr).toBe(0);
    expect(r.stderr).not.toMatch(/station observed/);
  });

  it('500 m north of the mark: a warning with the distance from the single-receiver position only', () => {
    const r = run('47.1279,8.765432,412.345', tempDir('rd-refpos-demo-far-'));
    expect(r.status, r.stderr).toBe(0);
    expect(r.stderr).toMatch(/the reference coordinate \(--ref-coord\) is 49\d m from the station observed in this file \(49\d m from its own single-receiver position, the median of its first 20 fixes\)/);
  });

  it('latitude and longitude swapped: exit 1', () => {
    const r = run('8.765432,47.123456,412.345', tempDir('rd-refpos-demo-swap-'));
    expect(r.status).toBe(1);
    expect(r.stderr).toMatch(/^refdelta: the reference coordinate \(--ref-coord\) is \d+ km from the station observed in .*KFRD-no-position\.obs \(\d+ km from its own single-receiver position, the median of its first 20 fixes\), so it cannot be that station's coordinate/m);
  });
});

/**
 * Names from inputs written to CSV stay inert in spreadsheets (OWASP "CSV Injection", common practice:
 * a leading apostrophe). Inputs: the invented demo files (fixtures/demo) with a marker name changed.
 */
import { beforeAll, describe, expect, it } from 'vitest';
import { readFileSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { REPO_ROOT } from './support/shared.js';
import { parseCsv, requireBuiltCli, runCli, tempDir } from './cli-support.js';

beforeAll(requireBuiltCli);

const demo = (f: string) => join(REPO_ROOT, 'fixtures/demo', f);
const EVIL = '=HYPERLINK("http://x.invalid","y")';

describe('formula injection through names (demo files, self-consistency)', () => {
  it('a MARKER NAME starting with = is written inert in epochs.csv and points.csv', () => {
    const dir = tempDir('rd-inj-');
    const rover = join(dir, 'rover.obs');
    writeFileSync(rover, readFileSync(demo('rover-1s.obs'), 'latin1').replace(/^MILLSTONE {51}MARKER NAME/m, EVIL.padEnd(60) + 'MARKER NAME'), 'latin1');
    const out = join(dir, 'out');
    const r = runCli(['points', '--rover', rover, '--reference', demo('KFRD-reference-5s.obs'), '--nav', demo('broadcast-mixed.nav'),
      '--ref-coord', 'KFRD', '--marks', demo('control-marks.csv'), '--outputs', 'epochs,summary', '--out', out]);
    expect(r.status, r.stderr).toBe(0);
    const epochs = readFileSync(join(out, 'epochs.csv'), 'utf8');
    expect(epochs).not.toMatch(/(^|,)"?=HYPERLINK/m);
    const ep = parseCsv(epochs);
    expect(ep.rows.some((row) => row.point === `'${EVIL}`)).toBe(true);
    const pts = readFileSync(join(out, 'points.csv'), 'utf8');
    expect(pts).not.toMatch(/(^|,)"?=HYPERLINK/m);
    expect(pts).toContain(`'=HYPERLINK`);
    // negative numbers are still numbers
    expect(ep.rows.some((row) => /^-\d/.test(row.baseline_up_m ?? ''))).toBe(true);
  });
});

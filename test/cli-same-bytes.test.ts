/**
 * Output bytes that must not change with how they are made:
 *  - the CSV lines of packages/cli/src/csv-lines.ts against csv-stringify (the general-purpose library
 *    the outputs were written with before), on random cells and on every row of real run outputs;
 *  - the bundled command (bin/refdelta.js -> dist/refdelta.mjs) against the modular build (dist/main.js)
 *    on the demo: the same files byte for byte (summary.json: but for its creation time and paths).
 */
import { spawnSync } from 'node:child_process';
import { readFileSync } from 'node:fs';
import { join, resolve } from 'node:path';
import { beforeAll, describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { stringify } from 'csv-stringify/sync';
import { csvLines } from '../packages/cli/src/csv-lines.js';
import { REPO_ROOT, dataPath, describeShared, fixturePath } from './support/shared.js';
import { requireBuiltCli, runCli, tempDir, type CliRun } from './cli-support.js';

const viaLibrary = (rows: string[][]): string => (rows.length ? stringify(rows, { record_delimiter: 'unix' }) : '');

/** The CSV text of a file without its comment lines. */
function bodyLines(text: string): string {
  return text.split('\n').filter((l) => !l.startsWith('#')).join('\n');
}

/** Cells of CSV text (RFC 4180 quoting), every row. */
function cellsOf(text: string): string[][] {
  const rows: string[][] = [];
  let row: string[] = [];
  let cur = '';
  let q = false;
  for (let i = 0; i < text.length; i++) {
    const c = text[i];
    if (q) {
      if (c === '"' && text[i + 1] === '"') { cur += '"'; i++; } else if (c === '"') q = false; else cur += c;
    } else if (c === '"') q = true;
    else if (c === ',') { row.push(cur); cur = ''; } else if (c === '\n') { row.push(cur); rows.push(row); row = []; cur = ''; } else cur += c;
  }
  return rows;
}

describe('csvLines gives the bytes of csv-stringify', () => {
  it('on random cells (commas, quotes, CR, LF, empty, non-ASCII)', () => {
    const cell = fc.oneof(fc.string(), fc.constantFrom('', ',', '"', '\n', '\r\n', 'a,b', 'say "x"', '-0.000', 'é'));
    fc.assert(fc.property(fc.array(fc.array(cell, { minLength: 1, maxLength: 6 }), { maxLength: 5 }), (rows) => {
      expect(csvLines(rows)).toBe(viaLibrary(rows));
    }), { numRuns: 2000 });
  });
});

function checkFileRows(path: string): void {
  const body = bodyLines(readFileSync(path, 'latin1'));
  const rows = cellsOf(body);
  expect(rows.length).toBeGreaterThan(10);
  expect(csvLines(rows)).toBe(viaLibrary(rows));
  expect(csvLines(rows)).toBe(body);
}

describe('the bundled refdelta command writes what the modular build writes (demo, self-consistency)', () => {
  const DEMO = (f: string) => fixturePath(`demo/${f}`);
  const args = (out: string) => [
    'solve', '--rover', DEMO('rover-1s.obs'), '--reference', DEMO('KFRD-reference-5s.obs'), '--nav', DEMO('broadcast-mixed.nav'),
    '--ref-coord', 'KFRD', '--marks', DEMO('control-marks.csv'), '--at-antenna', '--out', out, '--quiet',
  ];
  let modularOut = '', bundledOut = '';
  let modular: CliRun, bundled: CliRun;
  beforeAll(() => {
    requireBuiltCli();
    modularOut = tempDir('rd-modular-');
    bundledOut = tempDir('rd-bundled-');
    modular = runCli(args(modularOut));
    const r = spawnSync(process.execPath, [resolve(REPO_ROOT, 'packages/cli/bin/refdelta.js'), ...args(bundledOut)], { cwd: REPO_ROOT, encoding: 'utf8', timeout: 120_000 });
    bundled = { status: r.status, stdout: r.stdout ?? '', stderr: r.stderr ?? '' };
  }, 240_000);

  it('same exit, same messages, same files', () => {
    expect(modular.status, modular.stderr).toBe(0);
    expect(bundled.status, bundled.stderr).toBe(0);
    expect(bundled.stdout).toBe(modular.stdout);
    for (const f of ['epochs.csv', 'residuals.csv', 'positions.geojson']) {
      expect(readFileSync(join(bundledOut, f)).equals(readFileSync(join(modularOut, f))), f).toBe(true);
    }
    const summary = (dir: string) => readFileSync(join(dir, 'summary.json'), 'utf8').replaceAll(dir, 'OUT').replace(/"created_utc": "[^"]*"/, '');
    expect(summary(bundledOut)).toBe(summary(modularOut));
  });

  it('every CSV row of the demo run is what csv-stringify writes', () => {
    checkFileRows(join(modularOut, 'epochs.csv'));
    checkFileRows(join(modularOut, 'residuals.csv'));
  });
});

describeShared('CSV rows of the real static run are what csv-stringify writes', () => {
  const D = 'cors-and-rover-2018-277';
  let out = '';
  let run: CliRun;
  beforeAll(() => {
    requireBuiltCli();
    out = tempDir('rd-static-bytes-');
    run = runCli([
      'solve', '--rover', dataPath(`${D}/static-run/rover.obs`), '--reference', dataPath(`${D}/static-run/base.obs`),
      '--nav', dataPath(`${D}/reference/glw1277m.18n`), dataPath(`${D}/reference/glw1277m.18g`),
      '--ref-coord', '3774089.2120,-601661.6157,5089321.2474', '--ref-frame', 'WGS84', '--ref-epoch', '2018.76', '--out', out, '--quiet',
    ]);
  }, 240_000);

  it('epochs.csv and residuals.csv', () => {
    expect(run.status, run.stderr).toBe(0);
    checkFileRows(join(out, 'epochs.csv'));
    checkFileRows(join(out, 'residuals.csv'));
  });
});

#!/usr/bin/env node
/**
 * Before/after comparison of the CLI's outputs on every real dataset beside the project (../shared/data,
 * never walking-run) and on the demo: runs a fixed list of `refdelta` commands and prints one SHA-256 per
 * output file, with the run-dependent lines of summary.json (software version, timestamps, output paths)
 * left out of its hash. Usage:
 *   node scripts/compare-outputs.mjs > before.txt   (on the old tree)
 *   node scripts/compare-outputs.mjs > after.txt    (on the new tree)
 *   diff before.txt after.txt
 */
import { spawnSync } from 'node:child_process';
import { createHash } from 'node:crypto';
import { existsSync, mkdtempSync, readdirSync, readFileSync, rmSync, statSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { dirname, join, resolve } from 'node:path';
import { fileURLToPath } from 'node:url';

const root = resolve(dirname(fileURLToPath(import.meta.url)), '..');
const data = resolve(root, '..', 'shared', 'data');
const cli = join(root, 'packages', 'cli', 'dist', 'cli-entry.js');
const S = `${data}/cors-and-rover-2018-277`;
const SS = `${data}/single-station`;
const nav18 = [`${S}/reference/glw1277m.18n`, `${S}/reference/glw1277m.18g`];
const base = '3774089.2120,-601661.6157,5089321.2474';
const cors = '3774050.9626,-601852.6734,5089350.3688';
const demo = join(root, 'fixtures', 'demo');

const runs = [
  ['static rover-base code', ['solve', '--rover', `${S}/static-run/rover.obs`, '--reference', `${S}/static-run/base.obs`, '--nav', ...nav18, '--ref-coord', base, '--ref-frame', 'WGS84', '--ref-epoch', '2018.76']],
  ['static rover-base smoothed', ['solve', '--rover', `${S}/static-run/rover.obs`, '--reference', `${S}/static-run/base.obs`, '--nav', ...nav18, '--ref-coord', base, '--ref-frame', 'WGS84', '--ref-epoch', '2018.76', '--smooth', '100']],
  ['static rover-base GPS', ['solve', '--rover', `${S}/static-run/rover.obs`, '--reference', `${S}/static-run/base.obs`, '--nav', ...nav18, '--ref-coord', base, '--ref-frame', 'WGS84', '--ref-epoch', '2018.76', '--systems', 'G']],
  ['static rover-cors code', ['solve', '--rover', `${S}/static-run/rover.obs`, '--reference', `${S}/reference/glw1277m.18o`, '--nav', ...nav18, '--ref-coord', cors, '--ref-frame', 'unstated', '--ref-epoch', '2018.76']],
  ['static base-cors smoothed', ['solve', '--rover', `${S}/static-run/base.obs`, '--reference', `${S}/reference/glw1277m.18o`, '--nav', ...nav18, '--ref-coord', cors, '--ref-frame', 'unstated', '--ref-epoch', '2018.76', '--smooth', '100']],
  ['cors hour n against hour m+n', ['solve', '--rover', `${S}/reference/glw1277n.18o`, '--reference', `${S}/reference/glw1277m.18o`, `${S}/reference/glw1277n.18o`, '--nav', ...nav18, `${S}/reference/glw1277n.18n`, `${S}/reference/glw1277n.18g`, '--ref-coord', 'header']],
  ['DGAR day against itself GPS', ['solve', '--rover', `${SS}/dgar0100.24o.gz`, '--reference', `${SS}/dgar0100.24o.gz`, '--nav', `${SS}/brdc0100.24n.gz`, '--ref-coord', 'header', '--systems', 'G']],
  ['BELE day against itself', ['solve', '--rover', `${SS}/BELE00BRA_R_20240100000_01D_30S_MO.crx.gz`, '--reference', `${SS}/BELE00BRA_R_20240100000_01D_30S_MO.crx.gz`, '--nav', `${SS}/BRDC00IGS_R_20240100000_01D_MN.rnx.gz`, '--ref-coord', 'header']],
  ['demo points', ['points', '--rover', `${demo}/rover-1s.obs`, '--reference', `${demo}/KFRD-reference-5s.obs`, '--nav', `${demo}/broadcast-mixed.nav`, '--ref-coord', 'header', '--smooth', '100']],
];

function hashDir(dir) {
  const rows = [];
  for (const f of readdirSync(dir).sort()) {
    const p = join(dir, f);
    if (statSync(p).isDirectory()) continue;
    let text = readFileSync(p, 'utf8');
    if (f === 'summary.json') {
      const j = JSON.parse(text);
      for (const k of ['software', 'created_utc', 'outputs']) delete j[k];
      text = JSON.stringify(j).replaceAll(tmp, '<out>');
    }
    rows.push(`  ${f} ${createHash('sha256').update(text).digest('hex').slice(0, 16)}`);
  }
  return rows;
}

if (!existsSync(join(data, 'README.md'))) { console.log('../shared/data not found: nothing compared'); process.exit(0); }
const tmp = mkdtempSync(join(tmpdir(), 'rd-compare-'));
for (const [name, args] of runs) {
  const out = join(tmp, name.replace(/\W+/g, '-'));
  const r = spawnSync(process.execPath, [cli, ...args, '--out', out, '--quiet'], { encoding: 'utf8' });
  console.log(`${name}: exit ${r.status}${r.status !== 0 ? ` ${r.stderr.trim().split('\n').pop()}` : ''}`);
  if (existsSync(out)) for (const row of hashDir(out)) console.log(row);
}
rmSync(tmp, { recursive: true, force: true });

/**
 * The README's demo output cannot drift: `npm run demo`'s printout (stdout and stderr together) and the
 * first lines of out/demo/epochs.csv are compared with the blocks in README.md. File sizes in bytes are
 * masked (summary.json holds absolute input paths, whose length depends on where the checkout is) and
 * the checkout's own path is removed. Simulated demo data: this checks the document, not the world.
 */
import { spawnSync } from 'node:child_process';
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { REPO_ROOT } from './support/shared.js';
import { requireBuiltCli } from './cli-support.js';

function blockAfter(text: string, marker: string): string {
  const i = text.indexOf(marker);
  if (i < 0) throw new Error(`README.md has no '${marker}'`);
  const start = text.indexOf('```\n', i) + 4;
  return text.slice(start, text.indexOf('```\n', start));
}

const mask = (t: string) => t.split(`${REPO_ROOT}/`).join('').replace(/\(\d+ bytes\)/g, '(N bytes)').trimEnd();

describe('README demo output (simulated demo scenario)', () => {
  it('npm run demo prints what README.md shows, and epochs.csv starts as shown', () => {
    requireBuiltCli();
    const r = spawnSync('sh', ['-c', `"${process.execPath}" packages/cli/dist/demo.js 2>&1`], { cwd: REPO_ROOT, encoding: 'utf8', timeout: 180_000 });
    expect(r.status, r.stdout).toBe(0);
    const readme = readFileSync(join(REPO_ROOT, 'README.md'), 'utf8');
    expect(mask(r.stdout)).toBe(mask(blockAfter(readme, 'and prints (stdout and stderr together')));
    const shown = blockAfter(readme, 'The first lines of `out/demo/epochs.csv`').trimEnd().split('\n');
    const actual = readFileSync(join(REPO_ROOT, 'out/demo/epochs.csv'), 'utf8').split('\n').slice(0, shown.length);
    expect(actual.map((l) => (l.length > 160 ? `${l.slice(0, 157)}...` : l))).toEqual(shown);
  }, 200_000);
});

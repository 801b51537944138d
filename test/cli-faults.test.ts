/**
 * Faults around a run: the output folder checked before any processing, interrupts, leftovers of killed
 * runs, batch folder names, closed pipes, control characters. Inputs: the invented demo files
 * (fixtures/demo); the expected behaviour is our own contract (README "Exit codes").
 */
import { beforeAll, describe, expect, it } from 'vitest';
import { spawn, spawnSync } from 'node:child_process';
import { copyFileSync, existsSync, mkdirSync, readdirSync, readFileSync, symlinkSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { REPO_ROOT } from './support/shared.js';
import { CLI_MAIN, expectOneSentence, requireBuiltCli, runCli, tempDir } from './cli-support.js';
import { describeFailure } from '../packages/cli/dist/failure-sentence.js';

beforeAll(requireBuiltCli);

const demo = (f: string) => join(REPO_ROOT, 'fixtures/demo', f);
const solveArgs = (rover: string, out: string, extra: string[] = []) => ['solve', '--rover', rover, '--reference', demo('KFRD-reference-5s.obs'),
  '--nav', demo('broadcast-mixed.nav'), '--ref-coord', 'KFRD', '--marks', demo('control-marks.csv'), '--out', out, ...extra];
const temporaries = (dir: string): string[] => (existsSync(dir) ? readdirSync(dir).filter((n) => n.endsWith('.tmp') || n.startsWith('.refdelta-commit')) : []);

describe('output folder checked before any processing', () => {
  it('an existing file as --out', () => {
    const d = tempDir('rd-out-');
    writeFileSync(join(d, 'file'), 'x');
    const r = runCli(solveArgs(demo('rover-1s.obs'), join(d, 'file')));
    expect(r.status).toBe(1);
    expect(expectOneSentence(r)).toMatch(/is an existing file, not a folder/);
    expect(r.stderr).not.toMatch(/rover epochs/);
  });

  it('a folder inside /proc is refused at once (no endless recursive mkdir)', () => {
    const r = runCli(solveArgs(demo('rover-1s.obs'), '/proc/refdelta-x/y'), 20_000);
    expect(r.status).toBe(1);
    expect(expectOneSentence(r)).toMatch(/kernel file system/);
  });

  it('an input where an output would be written is refused before it is overwritten', () => {
    const d = tempDir('rd-out-');
    copyFileSync(demo('rover-1s.obs'), join(d, 'epochs.csv'));
    const before = readFileSync(join(d, 'epochs.csv'));
    const r = runCli(solveArgs(join(d, 'epochs.csv'), d));
    expect(r.status).toBe(1);
    expect(expectOneSentence(r)).toMatch(/is where the output epochs\.csv .* would be written/);
    expect(readFileSync(join(d, 'epochs.csv')).equals(before)).toBe(true);
  });

  it('system errors are sentences with the path, never "internal error: ENOSPC"', () => {
    const full = Object.assign(new Error('ENOSPC: no space left on device, write'), { code: 'ENOSPC', path: '/data/out/epochs.csv' });
    expect(describeFailure(full).sentence).toBe('/data/out/epochs.csv: no space left on the device: free some space or choose another --out');
    const ro = Object.assign(new Error('EROFS'), { code: 'EROFS', path: '/mnt/ro/x' });
    expect(describeFailure(ro).sentence).toMatch(/^\/mnt\/ro\/x: read-only file system/);
    const noPath = Object.assign(new Error('EEXIST'), { code: 'EEXIST' });
    expect(describeFailure(noPath).sentence).not.toMatch(/internal error/);
  });
});

describe('interrupts and leftovers of killed runs', () => {
  it('leftovers of a dead process are finished or removed by the next run', () => {
    const d = tempDir('rd-left-');
    const out = join(d, 'out');
    mkdirSync(out);
    // pid 2^22 + 1 is above Linux's pid_max limit: never a live process
    const dead = 4194305;
    writeFileSync(join(out, `.epochs.csv.${dead}.abc123.tmp`), 'half a file');
    writeFileSync(join(out, `.summary.json.${dead}.zz9.tmp`), 'sealed summary');
    writeFileSync(join(out, `.refdelta-commit.${dead}.json`), JSON.stringify({ renames: [[join(out, `.summary.json.${dead}.zz9.tmp`), join(out, 'old-summary.json')]], removes: [] }));
    const r = runCli(solveArgs(demo('rover-1s.obs'), out, ['--outputs', 'epochs,summary']));
    expect(r.status, r.stderr).toBe(0);
    expect(temporaries(out)).toEqual([]);
    expect(readFileSync(join(out, 'old-summary.json'), 'utf8')).toBe('sealed summary');
  });

  it('SIGTERM removes the temporary files and exits 143', async () => {
    const d = tempDir('rd-sig-');
    const child = spawn(process.execPath, [CLI_MAIN, ...solveArgs(demo('rover-1s.obs'), d, ['--json-lines'])], { cwd: REPO_ROOT });
    let out = '';
    await new Promise<void>((res) => child.stdout.on('data', (b: Buffer) => {
      out += b.toString();
      if (out.includes('"progress"') || out.includes('"start"')) res();
    }));
    await new Promise((r) => setTimeout(r, 300));
    child.kill('SIGTERM');
    const code = await new Promise<number | null>((res) => child.on('close', (c) => res(c)));
    // a run that finished before the signal arrived exits 0 (nothing to check then)
    if (code !== 0) expect(code).toBe(143);
    expect(temporaries(d)).toEqual([]);
  });
});

describe('batch folder names and odd entries', () => {
  it('two sessions whose names clean to the same folder get distinct folders, said so; dangling links and *.obs folders are reported', () => {
    const d = tempDir('rd-batch-names-');
    const sessions = join(d, 'sessions');
    mkdirSync(sessions);
    copyFileSync(demo('rover-1s.obs'), join(sessions, 'site 1.obs'));
    copyFileSync(demo('rover-1s.obs'), join(sessions, 'site_1.obs'));
    symlinkSync(join(d, 'missing.obs'), join(sessions, 'gone.obs'));
    mkdirSync(join(sessions, 'folder.obs'));
    const out = join(d, 'out');
    const r = runCli(['batch', '--sessions', sessions, '--reference', demo('KFRD-reference-5s.obs'), '--nav', demo('broadcast-mixed.nav'),
      '--ref-coord', 'KFRD', '--marks', demo('control-marks.csv'), '--outputs', 'summary', '--out', out]);
    expect(r.status, r.stderr).toBe(0);
    const s = JSON.parse(readFileSync(join(out, 'batch-summary.json'), 'utf8'));
    const folders = s.sessions.map((x: { name: string }) => x.name);
    expect(new Set(folders).size).toBe(2);
    for (const f of folders) expect(existsSync(join(out, f, 'summary.json'))).toBe(true);
    expect(r.stderr).toMatch(/would clash with another session/);
    expect(r.stderr).toMatch(/gone\.obs: a link whose target does not exist/);
    expect(r.stderr).toMatch(/folder\.obs: a folder, not a file/);
    expect(s.skipped_files.length).toBe(2);
  }, 60_000);
});

describe('terminals and pipes', () => {
  it('inspect --text | head -1 ends quietly', () => {
    const files = Array.from({ length: 40 }, () => demo('broadcast-mixed.nav'));
    const r = spawnSync('sh', ['-c', `"${process.execPath}" "${CLI_MAIN}" inspect --text ${files.map((f) => `"${f}"`).join(' ')} | head -1`], { encoding: 'utf8' });
    expect(r.stdout.split('\n').length).toBeLessThanOrEqual(2);
    expect(r.stderr).not.toMatch(/EPIPE|Error|at /);
  });

  it('control characters from an input are shown escaped', () => {
    const d = tempDir('rd-ctl-');
    const f = join(d, 'r.obs');
    const text = readFileSync(demo('rover-1s.obs'), 'latin1').replace(/^MILLSTONE {51}MARKER NAME/m, 'MILL\x1b]0;pwned\x07STONE'.padEnd(60) + 'MARKER NAME');
    writeFileSync(f, text, 'latin1');
    const r = runCli(['inspect', '--text', f]);
    expect(r.status).toBe(0);
    expect(r.stdout).not.toMatch(/[\x1b\x07]/);
    expect(r.stdout).toContain('MILL\\x1b]0;pwned\\x07STONE');
  });
});

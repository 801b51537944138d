/**
 * The command bounds V8's young generation: V8 reads that bound only when an isolate starts, so a command
 * that works on files runs in a child node started with `--max-semi-space-size=N`, and batch workers get
 * the same bound as a resource limit. Checks of the decision, and of the child actually started (Linux
 * /proc): not a memory measurement, which is the bench's (Part 5, peak RSS of a day against an hour).
 */
import { spawn } from 'node:child_process';
import { existsSync, readFileSync } from 'node:fs';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { needsBoundedChild, YOUNG_SEMI_SPACE_FLAG, YOUNG_SEMI_SPACE_MIB } from '../packages/cli/bin/heap-growth.js';
import { WORKER_YOUNG_GENERATION_MIB } from '../packages/cli/src/batch-workers.js';
import { REPO_ROOT } from './support/shared.js';
import { CLI_MAIN, requireBuiltCli, runCli, tempDir } from './cli-support.js';

describe('young generation of the command', () => {
  it("runs file commands in a bounded child, not short ones nor when node was given flags; three semi-spaces' worth for batch workers", () => {
    expect(YOUNG_SEMI_SPACE_FLAG).toBe(`--max-semi-space-size=${YOUNG_SEMI_SPACE_MIB}`);
    expect(WORKER_YOUNG_GENERATION_MIB).toBe(3 * YOUNG_SEMI_SPACE_MIB);
    expect(needsBoundedChild([], undefined, ['solve', '--rover', 'r.obs'])).toBe(true);
    expect(needsBoundedChild([], '', ['batch', '--sessions', 'd'])).toBe(true);
    expect(needsBoundedChild([], undefined, [])).toBe(false);
    expect(needsBoundedChild([], undefined, ['--version'])).toBe(false);
    expect(needsBoundedChild([], undefined, ['solve', '--help'])).toBe(false);
    expect(needsBoundedChild(['--inspect'], undefined, ['solve'])).toBe(false);
    expect(needsBoundedChild([], '--max-semi-space-size=4', ['solve'])).toBe(false);
  });

  it('passes the exit code and the messages of the child on', () => {
    requireBuiltCli();
    const r = runCli(['solve', '--rover', join(tempDir('rd-young-'), 'absent.obs'), '--nav', 'absent.nav', '--out', tempDir('rd-young-out-')]);
    expect(r.status).toBe(1);
    expect(r.stderr).toMatch(/absent\.obs/);
  });

  const procChildren = existsSync(`/proc/${process.pid}/task/${process.pid}/children`);
  it.skipIf(!procChildren)('starts the child node with the bound (Linux /proc: the command line of the running child)', async () => {
    requireBuiltCli();
    const demo = (f: string) => join(REPO_ROOT, 'fixtures/demo', f);
    const p = spawn(process.execPath, [CLI_MAIN, 'solve', '--rover', demo('rover-1s.obs'), '--reference', demo('KFRD-reference-5s.obs'), '--nav', demo('broadcast-mixed.nav'),
      '--ref-coord', 'KFRD', '--marks', demo('control-marks.csv'), '--carrier-phase', 'off', '--outputs', 'summary', '--quiet', '--out', tempDir('rd-young-demo-')], { stdio: 'ignore' });
    let childArgs: string[] | null = null;
    for (let i = 0; i < 200 && childArgs === null; i++) {
      await new Promise((r) => setTimeout(r, 25));
      const kids = readFileSync(`/proc/${p.pid}/task/${p.pid}/children`, 'latin1').trim().split(/\s+/).filter(Boolean);
      if (kids.length > 0) {
        try { childArgs = readFileSync(`/proc/${kids[0]}/cmdline`, 'latin1').split('\0'); } catch { /* ended already */ }
      }
    }
    const code = await new Promise<number | null>((done) => p.on('exit', done));
    expect(code).toBe(0);
    expect(childArgs).not.toBeNull();
    expect(childArgs!.slice(1, 4)).toEqual([YOUNG_SEMI_SPACE_FLAG, CLI_MAIN, 'solve']);
  });
});

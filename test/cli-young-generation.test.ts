/**
 * The command bounds V8's young generation from its first line (`#!/usr/bin/env -S node
 * --max-semi-space-size=N`), since V8 reads that setting only when a process starts, and gives batch
 * workers the same bound as a resource limit. Structural checks of the shipped files, and the command run
 * as an installed command runs (the kernel reads the first line): not a memory measurement, which is the
 * bench's (Part 5, peak RSS of a day against an hour).
 */
import { spawnSync } from 'node:child_process';
import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { YOUNG_SEMI_SPACE_MIB } from '../packages/cli/bin/heap-growth.js';
import { WORKER_YOUNG_GENERATION_MIB } from '../packages/cli/src/batch-workers.js';
import { CLI_MAIN, requireBuiltCli } from './cli-support.js';

describe('young generation of the command', () => {
  it("passes the semi-space bound to node on its first line, and three semi-spaces' worth to batch workers", () => {
    const first = readFileSync(CLI_MAIN, 'utf8').split('\n', 1)[0];
    expect(first).toBe(`#!/usr/bin/env -S node --max-semi-space-size=${YOUNG_SEMI_SPACE_MIB}`);
    expect(WORKER_YOUNG_GENERATION_MIB).toBe(3 * YOUNG_SEMI_SPACE_MIB);
  });

  it.skipIf(process.platform === 'win32')('runs when executed directly, as the installed command is', () => {
    requireBuiltCli();
    const version = JSON.parse(readFileSync(new URL('../packages/cli/package.json', import.meta.url), 'utf8')).version as string;
    const r = spawnSync(CLI_MAIN, ['--version'], { encoding: 'utf8' });
    expect(r.error).toBeUndefined();
    expect(r.status).toBe(0);
    expect(r.stdout.trim()).toContain(version);
  });
});

/**
 * A small seeded sample of `npm run fuzz` (fuzz/targets.mjs, fuzz/cli-corpus.mjs): every reader gets
 * generated damaged inputs made from the project's fixtures; none may crash or refuse with a sentence
 * naming neither file nor line. The full run (>= 100,000 inputs per reader, hangs and memory) is
 * `npm run fuzz`, outside the tests.
 */
import { describe, expect, it } from 'vitest';
import { describeShared } from './support/shared.js';
// @ts-expect-error plain ES module without types (fuzz/ is a script folder)
import { runOne, TARGETS } from '../fuzz/targets.mjs';
// @ts-expect-error plain ES module without types
import { runCliCorpus } from '../fuzz/cli-corpus.mjs';

const SEED = 20261202;
const PER_READER = 120;

describe('readers on generated damaged inputs (seeded sample of npm run fuzz)', () => {
  for (const target of Object.keys(TARGETS as Record<string, unknown>)) {
    it(`${target}: ${PER_READER} inputs, no crash, every refusal names the file or a line`, async () => {
      const bad: string[] = [];
      for (let i = 0; i < PER_READER; i++) {
        const r = (await runOne(target, SEED, i)) as { outcome: string; message?: string };
        if (r.outcome === 'crash' || r.outcome === 'unnamed') bad.push(`${i} ${r.outcome}: ${r.message}`);
      }
      expect(bad).toEqual([]);
    });
  }
});

describeShared('CLI on damaged real files (seeded sample of npm run fuzz)', () => {
  it('one damaged copy of each real file through inspect: exit 0 or 1, no stack trace, named sentences', async () => {
    const t = (await runCliCorpus({ seed: SEED, workers: 2, log: () => {}, perSource: 1, solve: false })) as { crash: number; hang: number; unnamed: number; runs: number; examples: unknown[] };
    expect(t.runs).toBeGreaterThan(5);
    expect({ crash: t.crash, hang: t.hang, unnamed: t.unnamed, examples: t.examples }).toEqual({ crash: 0, hang: 0, unnamed: 0, examples: [] });
  }, 120_000);
});

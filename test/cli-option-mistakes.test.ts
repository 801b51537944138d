/**
 * Command-line mistakes users make, each answered with one sentence: a mistyped option names the option
 * meant and an option of one value given twice is refused rather than turned into a list (exit 2); a
 * --systems that names none of the rover's systems is said so (exit 1).
 * The contract is our own; the edit distance is the optimal string alignment distance (Navarro 2001).
 */
import { beforeAll, describe, expect, it } from 'vitest';
import { editDistance, unknownOptionSentence } from '../packages/cli/src/option-suggestion.js';
import { join } from 'node:path';
import { REPO_ROOT } from './support/shared.js';
import { expectOneSentence, requireBuiltCli, runCli, tempDir } from './cli-support.js';

beforeAll(requireBuiltCli);

describe('option mistakes', () => {
  it('edit distance: substitutions, insertions, deletions and adjacent swaps count one each (textbook cases)', () => {
    expect(editDistance('kitten', 'sitting')).toBe(3);
    expect(editDistance('ref-cord', 'ref-coord')).toBe(1);
    expect(editDistance('ca', 'ac')).toBe(1);
    expect(editDistance('', 'nav')).toBe(3);
  });

  it('names each unknown option once, as typed, with the nearest known one when it is a typo', () => {
    expect(unknownOptionSentence('Unknown arguments: ref-cord, refCord', ['ref-coord', 'refCoord', 'nav', 'out']))
      .toBe('unknown option --ref-cord (did you mean --ref-coord?)');
    expect(unknownOptionSentence('Unknown argument: zzz', ['ref-coord', 'nav'])).toBe('unknown option --zzz');
    expect(unknownOptionSentence('Missing required argument: out', ['out'])).toBeNull();
  });

  it('the command answers a mistyped option with the option meant (exit 2)', () => {
    const r = runCli(['solve', '--rover', 'r.obs', '--nav', 'n.nav', '--out', tempDir('rd-opt-'), '--ref-cord', 'header']);
    expect(r.status).toBe(2);
    expect(expectOneSentence(r)).toMatch(/unknown option --ref-cord \(did you mean --ref-coord\?\)/);
  });

  it("--systems naming none of the rover's systems is said so, not blamed on the header (exit 1)", () => {
    const demo = (f: string) => join(REPO_ROOT, 'fixtures/demo', f);
    const r = runCli(['solve', '--rover', demo('rover-1s.obs'), '--reference', demo('KFRD-reference-5s.obs'), '--nav', demo('broadcast-mixed.nav'),
      '--ref-coord', 'KFRD', '--marks', demo('control-marks.csv'), '--systems', 'C', '--out', tempDir('rd-opt-sys-')]);
    expect(r.status).toBe(1);
    expect(expectOneSentence(r)).toMatch(/rover-1s\.obs holds observations of .* only, and the systems allowed \(C, --systems\) are none of them: give --systems with one of/);
  });

  it('refuses an option of one value given twice, naming both values (exit 2)', () => {
    const r = runCli(['solve', '--rover', 'r.obs', '--nav', 'n.nav', '--out', tempDir('rd-opt-'), '--ref-coord', '1,2,3', '--ref-frame', 'ETRS89', '--ref-frame', 'WGS84']);
    expect(r.status).toBe(2);
    expect(expectOneSentence(r)).toMatch(/--ref-frame was given 2 times \('ETRS89', 'WGS84'\): give it once/);
  });
});

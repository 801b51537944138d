/**
 * ../shared/bad-input/hubu00DEU_R_20230931500_01H_30S_MO.crx: a damaged compact RINEX 3 file.
 * Found by reading it: epochs 15:00:00-15:12:00 (compact lines 47-1262, CR LF), then line 1263 is a
 * full (initialisation) epoch line "> 2023 04 03 15 39  0.0000000  0 43" with no satellite list,
 * followed by 43 satellite lines and no later initialisation epoch.
 */
import { expect, it } from 'vitest';
import { openText } from '../packages/core/src/compress/index.js';
import { InputError } from '../packages/core/src/errors.js';
import type { Warning } from '../packages/core/src/errors.js';
import { describeShared, fileChunks, sharedPath } from './support/shared.js';

const FILE = 'bad-input/hubu00DEU_R_20230931500_01H_30S_MO.crx';

describeShared('damaged compact RINEX 3 (bad-input/hubu00DEU...crx)', () => {
  it('lenient: warnings name line 1263, epochs before it are kept complete', async () => {
    const warnings: Warning[] = [];
    const o = await openText(FILE, fileChunks(sharedPath(FILE)), { onWarning: (w) => warnings.push(w) });
    const parts: string[] = [];
    for await (const c of o.text) parts.push(c);
    const lines = parts.join('').split('\n');
    expect(warnings.map((w) => [w.code, w.line])).toEqual([
      ['crx-damaged', 1263],
      ['crx-unrecovered', 1263],
    ]);
    expect(warnings[0].message).toMatch(/fewer satellites than its count 43/);
    const ep = lines.filter((l) => l.startsWith('>'));
    // 15:00:00 .. 15:12:00 at 30 s = 25 epochs (epoch lines 47, 95, ..., 1215 of the compact file).
    expect(ep).toHaveLength(25);
    expect(ep[24]).toBe('> 2023 04 03 15 12  0.0000000  0 46');
    const last = lines.lastIndexOf(ep[24]);
    const n = Number(ep[24].slice(32, 35));
    expect(lines.slice(last + 1).filter((l) => l !== '')).toHaveLength(n);
  });

  it('strict (no warning sink): InputError naming the file and line 1263, after the text decoded before', async () => {
    const o = await openText(FILE, fileChunks(sharedPath(FILE), 4096));
    let text = '';
    let err: unknown = null;
    try {
      for await (const c of o.text) text += c;
    } catch (e) {
      err = e;
    }
    expect(err).toBeInstanceOf(InputError);
    expect((err as InputError).line).toBe(1263);
    expect((err as InputError).message).toContain(`${FILE}:1263:`);
    expect(text).toContain('> 2023 04 03 15 12  0.0000000  0 46');
  });
});

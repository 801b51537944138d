/**
 * Decoding the hatanaka-pairs (../shared/data/hatanaka-pairs: the same data compact/compressed and
 * plain, published with open-source format readers as test data) must give the plain partner:
 * normalised text line for line (CR LF -> LF, trailing blanks trimmed); where the partner writes
 * a number differently (".205" for "0.205", Fortran style) the 16-column fields are compared as
 * numbers, LLI and SSI as characters.
 */
import { readFileSync } from 'node:fs';
import { expect, it } from 'vitest';
import { openText } from '../packages/core/src/compress/index.js';
import type { Warning } from '../packages/core/src/errors.js';
import { dataPath, describeShared, fileChunks } from './support/shared.js';

async function decodeFile(rel: string, warnings: Warning[]): Promise<{ layers: string[]; text: string }> {
  const o = await openText(rel, fileChunks(dataPath(rel)), { onWarning: (w) => warnings.push(w) });
  const parts: string[] = [];
  for await (const c of o.text) parts.push(c);
  return { layers: o.layers, text: parts.join('') };
}

const normalise = (s: string): string[] => s.replace(/\r\n/g, '\n').split('\n').map((l) => l.trimEnd());

/** Observation lines as 16-column fields (F14.3 value, LLI, SSI; RINEX 2.11 table A2), values as numbers. */
function fields(line: string): [number, string, string][] {
  const out: [number, string, string][] = [];
  for (let c = 0; c < line.length; c += 16) {
    const v = line.slice(c, c + 14).trim();
    out.push([v === '' ? NaN : Number(v), line.charAt(c + 14) || ' ', line.charAt(c + 15) || ' ']);
  }
  return out;
}

/** Returns the first few differences (line number, decoded, plain), [] when equivalent. */
function compareRinexText(decoded: string, plain: string): { textEqualLines: number; fieldEqualLines: number; diffs: string[] } {
  const a = normalise(decoded);
  const b = normalise(plain);
  const diffs: string[] = [];
  let textEqualLines = 0;
  let fieldEqualLines = 0;
  if (a.length !== b.length) diffs.push(`line counts ${a.length} vs ${b.length}`);
  const n = Math.min(a.length, b.length);
  let inHeader = true;
  for (let i = 0; i < n && diffs.length < 5; i++) {
    if (a[i] === b[i]) {
      textEqualLines++;
    } else if (!inHeader && JSON.stringify(fields(a[i])) === JSON.stringify(fields(b[i]))) {
      fieldEqualLines++;
    } else {
      diffs.push(`line ${i + 1}:\n  decoded ${JSON.stringify(a[i])}\n  plain   ${JSON.stringify(b[i])}`);
    }
    if (b[i].slice(60).startsWith('END OF HEADER')) inHeader = false;
  }
  return { textEqualLines, fieldEqualLines, diffs };
}

describeShared('hatanaka-pairs: decoded text equals the plain partner', () => {
  const cases = [
    { packed: 'hatanaka-pairs/york0440.15d', plain: 'hatanaka-pairs/york0440.15o', layers: ['compact-rinex-1'], fieldOnly: 0 },
    { packed: 'hatanaka-pairs/brst155h.20d', plain: 'hatanaka-pairs/brst155h.20o', layers: ['compact-rinex-1'], fieldOnly: 3 },
    { packed: 'hatanaka-pairs/ac660270.18o.Z', plain: 'hatanaka-pairs/ac660270.18o', layers: ['unix-compress'], fieldOnly: 0 },
  ];
  for (const c of cases) {
    it(`${c.packed} -> ${c.plain}`, async () => {
      const warnings: Warning[] = [];
      const r = await decodeFile(c.packed, warnings);
      expect(warnings).toEqual([]);
      expect(r.layers).toEqual(c.layers);
      const plain = readFileSync(dataPath(c.plain), 'latin1');
      const cmp = compareRinexText(r.text, plain);
      expect(cmp.diffs).toEqual([]);
      // Lines equal only as numbers: brst155h.20o writes values below 1 as ".205" (Fortran F14.3).
      expect(cmp.fieldEqualLines).toBe(c.fieldOnly);
      expect(cmp.textEqualLines).toBeGreaterThan(900);
    });
  }

  it('ac660270.18o.Z decodes byte for byte to ac660270.18o (LZW, byte-alignment quirk)', async () => {
    const o = await openText('ac660270.18o.Z', fileChunks(dataPath('hatanaka-pairs/ac660270.18o.Z'), 777));
    const parts: string[] = [];
    for await (const t of o.text) parts.push(t);
    expect(parts.join('')).toBe(readFileSync(dataPath('hatanaka-pairs/ac660270.18o'), 'latin1').replace(/\r\n/g, '\n'));
  });
});

/**
 * openText with the byte decoder the command line injects (Node's Buffer latin1, node-io.ts latin1Text)
 * against the core's default TextDecoder('latin1') (WHATWG Encoding): the same text from real files
 * of ../shared/data (never walking-run/), plain, gzip, compact RINEX 1 and 3. RINEX is ASCII; the two
 * decoders differ only on bytes 0x80-0x9F, which these files do not hold.
 */
import { expect, it } from 'vitest';
import { dataPath, describeShared, fileChunks } from './support/shared.js';
import { openText } from '../packages/core/src/compress/open-text.js';
import { latin1Text } from '../packages/cli/src/node-io.js';

async function textOf(path: string, decodeLatin1?: (b: Uint8Array) => string): Promise<string> {
  const opened = await openText(path, fileChunks(path, 1 << 14), decodeLatin1 ? { decodeLatin1 } : {});
  const parts: string[] = [];
  for await (const c of opened.text) parts.push(c);
  return parts.join('');
}

describeShared('openText with the Buffer latin1 decoder gives the text of the default decoder', () => {
  for (const rel of [
    'single-station/dgar0100.24o.gz',
    'single-station/BELE00BRA_R_20240100000_01D_30S_MO.crx.gz',
    'single-station/REYK00ISL_R_20192701000_01H_30S_MO.rnx',
    'hatanaka-pairs/york0440.15d',
    'hatanaka-pairs/ac660270.18o.Z',
    'cors-and-rover-2018-277/reference/glw1277m.18n',
  ]) {
    it(rel, async () => {
      const want = await textOf(dataPath(rel));
      const got = await textOf(dataPath(rel), latin1Text);
      expect(got.length).toBeGreaterThan(1000);
      expect(got === want).toBe(true);
    }, 120_000);
  }
});

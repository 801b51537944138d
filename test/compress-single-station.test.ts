/**
 * Compact RINEX 3 files of ../shared/data/single-station decode without a warning; concrete values
 * checked by hand on the compact text (line numbers of the compact files cited beside each check).
 */
import { expect, it } from 'vitest';
import { openText } from '../packages/core/src/compress/index.js';
import type { Warning } from '../packages/core/src/errors.js';
import { dataPath, describeShared, fileChunks } from './support/shared.js';

async function decodeLines(rel: string): Promise<{ layers: string[]; lines: string[]; warnings: Warning[]; chunkMax: number }> {
  const warnings: Warning[] = [];
  const o = await openText(rel, fileChunks(dataPath(rel)), { onWarning: (w) => warnings.push(w) });
  const parts: string[] = [];
  let chunkMax = 0;
  for await (const c of o.text) {
    parts.push(c);
    chunkMax = Math.max(chunkMax, c.length);
  }
  return { layers: o.layers, lines: parts.join('').split('\n'), warnings, chunkMax };
}

const epochs = (lines: string[]): string[] => lines.filter((l) => l.startsWith('>'));

describeShared('single-station compact RINEX 3 files', () => {
  it('BRUX00BEL_R_20202302000_01H_30S_MO.crx: first epoch, first satellite, its first difference', async () => {
    const r = await decodeLines('single-station/BRUX00BEL_R_20202302000_01H_30S_MO.crx');
    expect(r.warnings).toEqual([]);
    expect(r.layers).toEqual(['compact-rinex-3']);
    const ep = epochs(r.lines);
    expect(ep).toHaveLength(120); // one hour at 30 s (file name: 01H_30S)
    // .crx line 55: "> 2020 08 17 20 00  0.0000000  0 41      C05C07..." (no clock: line 56 empty)
    expect(ep[0]).toBe('> 2020 08 17 20 00  0.0000000  0 41');
    const first = r.lines.indexOf(ep[0]);
    // .crx line 57: 8 blank fields (C1P..S5P), then C2I 3&40402632182, L2I 3&210387114589, D2I 3&-14171,
    // S2I 3&35188; flags "&&&&&&&&&&&&&&&&&505&5&&" -> C2I SSI 5, L2I LLI 0 SSI 5, D2I SSI 5.
    expect(r.lines[first + 1].slice(0, 3 + 12 * 16)).toBe(
      'C05' + ' '.repeat(8 * 16) + '  40402632.182 5 210387114.58905       -14.171 5        35.188  ',
    );
    // .crx line 100 (C05, second epoch): first differences 81334 422629 150 -188.
    const second = r.lines.indexOf(ep[1]);
    expect(r.lines[second + 1].slice(3 + 8 * 16, 3 + 12 * 16)).toBe('  40402713.516 5 210387537.21805       -14.021 5        35.000  ');
    expect(r.chunkMax).toBeLessThan(1 << 17);
  });

  it('CEBR00ESP_R_20182000000_01D_30S_MO.crx.gz: gzip + compact RINEX 3, full day', async () => {
    const r = await decodeLines('single-station/CEBR00ESP_R_20182000000_01D_30S_MO.crx.gz');
    expect(r.warnings).toEqual([]);
    expect(r.layers).toEqual(['gzip', 'compact-rinex-3']);
    const ep = epochs(r.lines);
    expect(ep.length).toBeGreaterThan(2800); // a day at 30 s is 2880 epochs
    // decompressed line 48: "> 2018 07 19 00 00  0.0000000  0 38      G28E09..."
    expect(ep[0]).toBe('> 2018 07 19 00 00  0.0000000  0 38');
    // line 50 (G28; G types C1C L1C D1C S1C C1W S1W C2W ...): 3&23074455907 3&121257095718 3&2477620 3&42750,
    // flags "&707&7&&" -> C1C SSI 7, L1C LLI 0 SSI 7, D1C SSI 7.
    const first = r.lines.indexOf(ep[0]);
    expect(r.lines[first + 1].slice(0, 67)).toBe('G28  23074455.907 7 121257095.71807      2477.620 7        42.750  ');
  });

  it('BELE00BRA_R_20240100000_01D_30S_MO.crx.gz: gzip + compact RINEX 3, receiver clock offset', async () => {
    const r = await decodeLines('single-station/BELE00BRA_R_20240100000_01D_30S_MO.crx.gz');
    expect(r.warnings).toEqual([]);
    expect(r.layers).toEqual(['gzip', 'compact-rinex-3']);
    const ep = epochs(r.lines);
    expect(ep.length).toBeGreaterThan(2800);
    // decompressed lines 210-211: "> 2024 01 10 00 00 00.0000000  0 38      C12..." then clock "3&2000"
    // (1e-12 s units) -> F15.12 in columns 42-56 (RINEX 3.05 table A3).
    expect(ep[0]).toBe('> 2024 01 10 00 00 00.0000000  0 38       0.000000002000');
    // line 212 (C12; C types C2I C6I C7I L2I ...): 3&25479194570 ..., flags "&6&5&5&6" -> SSI 6, 5, 5, 6.
    const first = r.lines.indexOf(ep[0]);
    expect(r.lines[first + 1].slice(0, 67)).toBe('C12  25479194.570 6  25479184.832 5  25479193.734 5 132676828.451 6');
  });
});

/**
 * Which encoding a byte stream or text uses: by content (magic numbers, first line) and, as a hint
 * only, by file name (RINEX 2.11 section 4 short names: .yyo plain, .yyd compact, + .Z / .gz;
 * RINEX 3.05 section 4 long names: .rnx plain, .crx compact, + .gz).
 */
import type { CompactRinexVersion } from './compact-rinex.js';
import { GZIP_MAGIC } from './gzip.js';
import { UNIX_COMPRESS_MAGIC } from './unix-compress.js';

export type Encoding = 'plain' | 'gzip' | 'unix-compress' | 'compact-rinex-1' | 'compact-rinex-3';

/** A binary compression layer found by its magic number, or null. */
export function sniffBinaryLayer(head: Uint8Array): 'gzip' | 'unix-compress' | null {
  if (head.length >= 2 && head[0] === GZIP_MAGIC[0] && head[1] === GZIP_MAGIC[1]) return 'gzip';
  if (head.length >= 2 && head[0] === UNIX_COMPRESS_MAGIC[0] && head[1] === UNIX_COMPRESS_MAGIC[1]) return 'unix-compress';
  return null;
}

/** Names of compressions we do not decode, by magic number (for a clear message). */
export function sniffUnsupported(head: Uint8Array): string | null {
  const b = (i: number): number => (i < head.length ? head[i] : -1);
  if (b(0) === 0x42 && b(1) === 0x5a && b(2) === 0x68) return 'bzip2';
  if (b(0) === 0x50 && b(1) === 0x4b && b(2) === 0x03 && b(3) === 0x04) return 'zip';
  if (b(0) === 0xfd && b(1) === 0x37 && b(2) === 0x7a && b(3) === 0x58 && b(4) === 0x5a) return 'xz';
  if (b(0) === 0x28 && b(1) === 0xb5 && b(2) === 0x2f && b(3) === 0xfd) return 'zstd';
  if (b(0) === 0x1f && b(1) === 0xa0) return 'LZH (SCO compress -H)';
  if (b(0) === 0x1f && b(1) === 0x1e) return 'pack';
  return null;
}

/**
 * Compact RINEX version from the first line: 'CRINEX VERS   / TYPE' in columns 61-80 or
 * 'COMPACT RINEX FORMAT' in columns 21-40, version in columns 1-9 (Compact RINEX format 1.0 / 3.0).
 * Returns null when the line is not a compact RINEX first line, 'unsupported' for another version.
 */
export function sniffCompactRinex(firstLine: string): CompactRinexVersion | 'unsupported' | null {
  const isCrx = firstLine.slice(60).startsWith('CRINEX VERS') || firstLine.slice(20, 40).trimEnd() === 'COMPACT RINEX FORMAT';
  if (!isCrx) return null;
  const v = Number(firstLine.slice(0, 9));
  if (v >= 1 && v < 2) return 1;
  if (v >= 3 && v < 4) return 3;
  return 'unsupported';
}

/** Layers the file name suggests, outermost first (a hint; content decides). Empty when the name says nothing. */
export function encodingsFromName(file: string): Encoding[] {
  const base = file.replace(/^.*[\\/]/, '');
  const layers: Encoding[] = [];
  let rest = base;
  for (;;) {
    if (/\.gz$/i.test(rest)) {
      layers.push('gzip');
      rest = rest.slice(0, -3);
    } else if (/\.Z$/.test(rest)) {
      layers.push('unix-compress');
      rest = rest.slice(0, -2);
    } else break;
  }
  if (/\.crx$/i.test(rest)) layers.push('compact-rinex-3');
  else if (/\.\d\dd$/i.test(rest)) layers.push('compact-rinex-1');
  else if (layers.length === 0 && !/\.(rnx|\d\d[ognlhpmbcq])$/i.test(rest)) return [];
  return layers;
}

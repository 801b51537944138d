/**
 * openText: peels compression layers off a byte stream (gzip, Unix compress, compact RINEX), in the
 * order the content shows, and yields the plain text in chunks of about 64 KiB whose lines are
 * separated by '\n' (CR LF turned into LF).
 *
 * Problems inside a layer (truncated gzip/.Z stream, damaged compact RINEX record) go to
 * `opts.onWarning` when given, and decoding goes on with what is left (what was decoded before is
 * always delivered first). Without a warning sink they are thrown as InputError after the text
 * decoded before them. Input that is no text at all is a FormatError.
 */
import { FormatError, InputError, RefdeltaError } from '../errors.js';
import type { WarningSink } from '../errors.js';
import { PeekableBytes } from './byte-source.js';
import { CompactRinexDecoder } from './compact-rinex.js';
import { ObservationRecords, offerObservationRecords } from './observation-records.js';
import { textWithClaimableBytes } from './byte-text.js';
import type { CompactRinexVersion } from './compact-rinex.js';
import { encodingsFromName, sniffBinaryLayer, sniffCompactRinex, sniffUnsupported } from './encoding.js';
import type { Encoding } from './encoding.js';
import { gunzip } from './gzip.js';
import { decompressUnix } from './unix-compress.js';
import { lineTooLongReason, MAX_LINE_CHARS } from '../text-limits.js';

export interface OpenTextOptions {
  readonly onWarning?: WarningSink;
  /**
   * Bytes to characters one for one, e.g. Node's Buffer latin1 decoding (2-3x TextDecoder there).
   * Default: TextDecoder('latin1'), which runs everywhere. The stream is cut at arbitrary bytes, so
   * the decoder must map each byte to one character.
   */
  readonly decodeLatin1?: (bytes: Uint8Array) => string;
}

export interface OpenedText {
  /** Layers found, outermost first; ['plain'] when the input was plain text. */
  readonly layers: Encoding[];
  readonly text: AsyncIterable<string>;
}

/** Text chunks handed out hold about this many characters. */
export const TEXT_CHUNK_CHARS = 1 << 16;
/** Nested binary layers peeled at most (a .gz inside a .gz...). */
const MAX_BINARY_LAYERS = 4;
/** Bytes looked at for the first line. */
const FIRST_LINE_BYTES = 1024;

export async function openText(file: string, bytes: AsyncIterable<Uint8Array>, opts: OpenTextOptions = {}): Promise<OpenedText> {
  const onWarning = opts.onWarning;
  const layers: Encoding[] = [];
  let firstDamage: string | null = null;
  const damage = (code: string, message: string, line = 0): void => {
    firstDamage ??= message;
    if (onWarning) onWarning({ file, line, code, message });
    else throw new InputError(file, line, message);
  };
  let src = new PeekableBytes(bytes);
  for (let depth = 0; depth < MAX_BINARY_LAYERS; depth++) {
    const head = await src.peek(8);
    const layer = sniffBinaryLayer(head);
    if (layer === null) {
      const other = sniffUnsupported(head);
      if (other !== null) throw new FormatError(file, 0, `the file is compressed with ${other}, which is not read here: decompress it first (gzip, Unix compress and compact RINEX are read)`);
      break;
    }
    layers.push(layer);
    const inner =
      layer === 'gzip'
        ? gunzip(src.chunks(), (reason) => damage('gzip-damaged', `${reason}; the text decoded before it is kept`))
        : decompressUnix(src.chunks(), (reason, at) => damage('unix-compress-damaged', `Unix compress (.Z) stream damaged or truncated near byte ${at}: ${reason}; the text decoded before it is kept`));
    src = new PeekableBytes(inner);
  }
  let head = await src.peek(FIRST_LINE_BYTES);
  if (head.length === 0 && firstDamage !== null) {
    // Nothing decoded at all: the layer's header itself is damaged (not an empty or non-RINEX file).
    throw new InputError(file, 0, `the ${layers.join(' + ')} layer is damaged from its first bytes, nothing could be decoded: ${firstDamage}`);
  }
  if (head[0] === 0xef && head[1] === 0xbb && head[2] === 0xbf) {
    // A UTF-8 byte order mark (Unicode 15.0 section 23.8) is not part of the RINEX text: dropped before
    // the one-for-one latin1 decoding, which would turn it into three characters.
    src = new PeekableBytes(dropBytes(src.chunks(), 3));
    head = await src.peek(FIRST_LINE_BYTES);
  }
  if (head.includes(0)) {
    throw new FormatError(file, 1, `not a text file (binary bytes${layers.length > 0 ? ` after ${layers.join(' + ')}` : ''}): RINEX text expected`);
  }
  const firstLine = latin1Line(head);
  const crx = sniffCompactRinex(firstLine);
  if (crx === 'unsupported') {
    throw new FormatError(file, 1, `compact RINEX version '${firstLine.slice(0, 9).trim()}' is not read here (1.0 and 3.0 are)`);
  }
  if (crx !== null) layers.push(crx === 1 ? 'compact-rinex-1' : 'compact-rinex-3');
  const hinted = encodingsFromName(file);
  if (hinted.length > 0 && hinted.join('+') !== layers.join('+')) {
    onWarning?.({
      file,
      line: 0,
      code: 'encoding-name-mismatch',
      message: `the name suggests ${hinted.join(' + ')} but the content is ${layers.length > 0 ? layers.join(' + ') : 'plain text'}; read by content`,
    });
  }
  if (crx === null) {
    // the bytes may be taken instead of the text by a reader of bytes (byte-text.ts)
    const decodeLatin1Bytes = opts.decodeLatin1;
    const lineBytes = { chunks: src.chunks(), decode: decodeLatin1Bytes ?? decodeLatin1Once };
    const text = textWithClaimableBytes(lineBytes, (b) => normaliseLineEnds(decodeLatin1Bytes ? decodeBytewise(b, decodeLatin1Bytes) : decodeLatin1(b)));
    return { layers: layers.length > 0 ? layers : ['plain'], text };
  }
  const chars = opts.decodeLatin1 ? decodeBytewise(src.chunks(), opts.decodeLatin1) : decodeLatin1(src.chunks());
  const records = new ObservationRecords();
  const text = decodeCompact(file, crx, chars, onWarning, opts.decodeLatin1, records);
  // observation values may travel as numbers to the observation reader (observation-records.ts)
  offerObservationRecords(text, records);
  return { layers: layers.length > 0 ? layers : ['plain'], text };
}

/** The byte stream without its first `n` bytes. */
async function* dropBytes(bytes: AsyncIterable<Uint8Array>, n: number): AsyncIterable<Uint8Array> {
  let left = n;
  for await (const b of bytes) {
    if (left >= b.length) { left -= b.length; continue; }
    yield left > 0 ? b.subarray(left) : b;
    left = 0;
  }
}

function latin1Line(head: Uint8Array): string {
  let end = head.indexOf(10);
  if (end < 0) end = head.length;
  return new TextDecoder('latin1').decode(head.subarray(0, end)).replace(/\r$/, '');
}

/**
 * Bytes to characters one for one (WHATWG 'latin1' = windows-1252): RINEX is ASCII, and a stray
 * non-ASCII byte in a comment keeps the columns of the line where they are.
 */
async function* decodeLatin1(bytes: AsyncIterable<Uint8Array>): AsyncIterable<string> {
  const dec = new TextDecoder('latin1');
  for await (const b of bytes) {
    const s = dec.decode(b, { stream: true });
    if (s.length > 0) yield s;
  }
  const tail = dec.decode();
  if (tail.length > 0) yield tail;
}

/** Bytes to characters by a single-byte decoder given by the caller. */
async function* decodeBytewise(bytes: AsyncIterable<Uint8Array>, decode: (bytes: Uint8Array) => string): AsyncIterable<string> {
  for await (const b of bytes) if (b.length > 0) yield decode(b);
}

/** TextDecoder('latin1') on one piece of bytes (openText's default decoding, for a line). */
function decodeLatin1Once(bytes: Uint8Array): string {
  return new TextDecoder('latin1').decode(bytes);
}

async function* normaliseLineEnds(chunks: AsyncIterable<string>): AsyncIterable<string> {
  let carry = '';
  for await (const c of chunks) {
    let s = carry + c;
    carry = '';
    if (s.endsWith('\r')) {
      carry = '\r';
      s = s.slice(0, -1);
    }
    // CR LF and a lone CR (old Mac line ends) both end a line.
    if (s.length > 0) yield s.includes('\r') ? s.replace(/\r\n?/g, '\n') : s;
  }
  if (carry) yield carry;
}

async function* decodeCompact(
  file: string,
  version: CompactRinexVersion,
  chunks: AsyncIterable<string>,
  onWarning: WarningSink | undefined,
  decodeSingleByte: ((bytes: Uint8Array) => string) | undefined,
  records: ObservationRecords,
): AsyncIterable<string> {
  records.started = true;
  const dec = new CompactRinexDecoder(file, version, (line, code, message) => {
    if (onWarning) onWarning({ file, line, code, message });
    else if (code !== 'crx-resumed') throw new InputError(file, line, message);
  }, decodeSingleByte, records.claimed ? records : null);
  const flush = (): string => dec.takeText();
  let rest = '';
  try {
    for await (const c of chunks) {
      const s = rest.length > 0 ? rest + c : c;
      let start = 0;
      for (;;) {
        const nl = s.indexOf('\n', start);
        if (nl < 0) break;
        dec.pushLine(s.slice(start, nl));
        start = nl + 1;
        if (dec.pendingChars >= TEXT_CHUNK_CHARS) yield flush();
      }
      rest = start === 0 ? s : s.slice(start);
      if (rest.length > MAX_LINE_CHARS) throw new InputError(file, dec.lineNumber + 1, lineTooLongReason(dec.lineNumber + 1));
    }
    if (rest.length > 0) dec.pushLine(rest);
    dec.finish();
  } catch (e) {
    const t = flush();
    if (t.length > 0) yield t;
    if (e instanceof RefdeltaError) throw e;
    // Defensive: no untyped error leaves the decoder.
    throw new InputError(file, dec.lineNumber, `compact RINEX record could not be decoded (${e instanceof Error ? e.message : String(e)})`);
  }
  const t = flush();
  if (t.length > 0) yield t;
}

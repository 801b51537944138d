/**
 * Unix `compress` (.Z) decoder: LZW with variable code width 9..16 bits, codes packed least
 * significant bit first, optional block mode with the CLEAR code 256.
 *
 * Source: the format of the original `compress` 4.0 tool (Welch 1984, "A Technique for
 * High-Performance Data Compression", IEEE Computer 17(6), as adapted by Thomas, McKie, Davies et al.):
 * header 1F 9D, then one byte `bbbbb` = maximum code width (bits 0-4) and block-mode flag (bit 7).
 * The tool reads codes in groups of 8 (a group is `nBits` bytes); when the code width grows, or after
 * a CLEAR code, the unread rest of the current group is skipped. That byte-alignment quirk is
 * reproduced here, otherwise any file longer than a few hundred codes decodes to garbage.
 *
 * Streaming: push() takes input chunks and returns output chunks; memory is bounded by the 64 Ki
 * entry string table and one output buffer.
 */

/** First byte pair of a .Z file. */
export const UNIX_COMPRESS_MAGIC = [0x1f, 0x9d] as const;

const CLEAR_CODE = 256;
const INIT_BITS = 9;
const OUT_CHUNK_BYTES = 1 << 16;

/** Thrown by the decoder when the stream cannot be decoded further; the caller attaches file names. */
export class UnixCompressDamage extends Error {
  override readonly name = 'UnixCompressDamage';
}

export class UnixCompressDecoder {
  private headerBytes: number[] = [];
  private headerDone = false;
  private maxBits = 16;
  private blockMode = true;
  private maxMaxCode = 1 << 16;
  private nBits = INIT_BITS;
  private maxCode = (1 << INIT_BITS) - 1;
  private freeEnt = 257;
  private bitBuf = 0;
  private bitCount = 0;
  private skipBytes = 0;
  private codesInGroup = 0;
  private oldCode = -1;
  private finChar = 0;
  private failed = false;
  private readonly prefix = new Uint16Array(1 << 16);
  private readonly suffix = new Uint8Array(1 << 16);
  private readonly stack = new Uint8Array(1 << 16);
  private out = new Uint8Array(OUT_CHUNK_BYTES);
  private outPos = 0;
  private ready: Uint8Array[] = [];
  /** Number of input bytes consumed so far (for error messages). */
  bytesIn = 0;

  /** Decode one input chunk; returns the output chunks completed so far. Throws UnixCompressDamage on a bad code. */
  push(chunk: Uint8Array): Uint8Array[] {
    if (this.failed) return [];
    let i = 0;
    const n = chunk.length;
    while (!this.headerDone && i < n) {
      this.headerBytes.push(chunk[i++]);
      this.bytesIn++;
      if (this.headerBytes.length === 3) this.readHeader();
    }
    for (; i < n; i++) {
      this.bytesIn++;
      if (this.skipBytes > 0) {
        this.skipBytes--;
        continue;
      }
      this.bitBuf |= chunk[i] << this.bitCount;
      this.bitCount += 8;
      if (this.bitCount >= this.nBits) {
        const code = this.bitBuf & ((1 << this.nBits) - 1);
        this.bitBuf >>>= this.nBits;
        this.bitCount -= this.nBits;
        this.codesInGroup = (this.codesInGroup + 1) & 7;
        try {
          this.decodeCode(code);
        } catch (e) {
          this.failed = true;
          throw e;
        }
      }
    }
    return this.take();
  }

  /** End of input: returns the remaining output. Throws UnixCompressDamage when the header is incomplete. */
  finish(): Uint8Array[] {
    if (!this.failed && !this.headerDone) {
      this.failed = true;
      throw new UnixCompressDamage(`truncated: ${this.headerBytes.length} of the 3 header bytes present`);
    }
    if (this.outPos > 0) {
      this.ready.push(this.out.slice(0, this.outPos));
      this.outPos = 0;
    }
    return this.take();
  }

  private take(): Uint8Array[] {
    const r = this.ready;
    this.ready = [];
    return r;
  }

  private readHeader(): void {
    const [m0, m1, flags] = this.headerBytes;
    if (m0 !== UNIX_COMPRESS_MAGIC[0] || m1 !== UNIX_COMPRESS_MAGIC[1]) {
      this.failed = true;
      throw new UnixCompressDamage('not a Unix compress stream (magic 1F 9D expected)');
    }
    this.maxBits = flags & 0x1f;
    this.blockMode = (flags & 0x80) !== 0;
    if (this.maxBits < INIT_BITS || this.maxBits > 16) {
      this.failed = true;
      throw new UnixCompressDamage(`maximum code width ${this.maxBits} bits in the header (9 to 16 expected)`);
    }
    this.maxMaxCode = 1 << this.maxBits;
    this.freeEnt = this.blockMode ? 257 : 256;
    this.headerDone = true;
  }

  private emit(b: number): void {
    this.out[this.outPos++] = b;
    if (this.outPos === OUT_CHUNK_BYTES) {
      this.ready.push(this.out);
      this.out = new Uint8Array(OUT_CHUNK_BYTES);
      this.outPos = 0;
    }
  }

  /**
   * Skip the rest of the current group of 8 codes (compress 4.0 getcode(): a new buffer of nBits bytes
   * is read whenever the width changes or after CLEAR). The group is byte aligned, so after dropping the
   * bits already buffered, a whole number of bytes remains to skip.
   */
  private skipRestOfGroup(): void {
    if (this.codesInGroup === 0) return;
    const remainingBits = (8 - this.codesInGroup) * this.nBits;
    const dropped = Math.min(remainingBits, this.bitCount);
    this.bitBuf = 0;
    this.bitCount -= dropped;
    this.skipBytes += (remainingBits - dropped) >> 3;
    this.codesInGroup = 0;
  }

  private decodeCode(code: number): void {
    if (this.blockMode && code === CLEAR_CODE) {
      this.skipRestOfGroup();
      this.nBits = INIT_BITS;
      this.maxCode = (1 << INIT_BITS) - 1;
      // compress 4.0 sets free_ent = FIRST - 1 and the code after CLEAR fills that (unused) slot; with
      // the next code treated as a first code the table positions are the same.
      this.freeEnt = 257;
      this.oldCode = -1;
      return;
    }
    if (this.oldCode < 0) {
      if (code >= 256) throw new UnixCompressDamage(`code ${code} where a literal byte was expected`);
      this.emit(code);
      this.oldCode = code;
      this.finChar = code;
      return;
    }
    const inCode = code;
    let sp = 0;
    const stack = this.stack;
    if (code >= this.freeEnt) {
      if (code > this.freeEnt) throw new UnixCompressDamage(`code ${code} beyond the table (next free entry ${this.freeEnt})`);
      // Welch 1984: the KwKwK case, the string is the previous one plus its own first character.
      stack[sp++] = this.finChar;
      code = this.oldCode;
    }
    while (code >= 256) {
      stack[sp++] = this.suffix[code];
      code = this.prefix[code];
    }
    this.finChar = code;
    stack[sp++] = code;
    while (sp > 0) this.emit(stack[--sp]);
    if (this.freeEnt < this.maxMaxCode) {
      this.prefix[this.freeEnt] = this.oldCode;
      this.suffix[this.freeEnt] = this.finChar;
      this.freeEnt++;
    }
    this.oldCode = inCode;
    if (this.freeEnt > this.maxCode && this.nBits < this.maxBits) {
      this.skipRestOfGroup();
      this.nBits++;
      this.maxCode = this.nBits === this.maxBits ? this.maxMaxCode : (1 << this.nBits) - 1;
    }
  }
}

/** Streams a .Z byte stream into its decompressed bytes. Damage is reported through `onDamage` and ends the stream. */
export async function* decompressUnix(
  bytes: AsyncIterable<Uint8Array>,
  onDamage: (reason: string, bytesIn: number) => void,
): AsyncIterable<Uint8Array> {
  const dec = new UnixCompressDecoder();
  try {
    for await (const chunk of bytes) {
      for (const o of dec.push(chunk)) yield o;
    }
    for (const o of dec.finish()) yield o;
  } catch (e) {
    if (!(e instanceof UnixCompressDamage)) throw e;
    // Deliver what was decoded before the damage, then report it.
    try {
      for (const o of dec.finish()) yield o;
    } catch {
      /* header incomplete: nothing to deliver */
    }
    onDamage(e.message, dec.bytesIn);
  }
}

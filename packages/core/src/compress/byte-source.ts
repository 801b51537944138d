/**
 * A byte stream whose first bytes can be looked at before it is consumed (for sniffing the
 * encoding), then read in full, the looked-at bytes included.
 */

export class PeekableBytes {
  private readonly it: AsyncIterator<Uint8Array>;
  private readonly buffered: Uint8Array[] = [];
  private bufferedBytes = 0;
  private ended = false;

  constructor(source: AsyncIterable<Uint8Array>) {
    this.it = source[Symbol.asyncIterator]();
  }

  /** At least `n` first bytes (fewer when the stream is shorter), without consuming them. */
  async peek(n: number): Promise<Uint8Array> {
    while (this.bufferedBytes < n && !this.ended) {
      const r = await this.it.next();
      if (r.done) {
        this.ended = true;
        break;
      }
      if (r.value.length === 0) continue;
      this.buffered.push(r.value);
      this.bufferedBytes += r.value.length;
    }
    return concatBytes(this.buffered, Math.min(n, this.bufferedBytes));
  }

  /**
   * The whole stream, from the first byte. A consumer that stops early (return(), or a for-await left
   * by break or an error) stops the source too, so that a file behind it is closed now.
   */
  async *chunks(): AsyncIterable<Uint8Array> {
    try {
      while (this.buffered.length > 0) yield this.buffered.shift() as Uint8Array;
      this.bufferedBytes = 0;
      while (!this.ended) {
        const r = await this.it.next();
        if (r.done) this.ended = true;
        else yield r.value;
      }
    } finally {
      if (!this.ended) {
        this.ended = true;
        await this.it.return?.();
      }
    }
  }

  /** Stops the source without reading it (a stream given up before its chunks were asked for). */
  async close(): Promise<void> {
    if (this.ended) return;
    this.ended = true;
    this.buffered.length = 0;
    this.bufferedBytes = 0;
    await this.it.return?.();
  }
}

function concatBytes(parts: readonly Uint8Array[], n: number): Uint8Array {
  const out = new Uint8Array(n);
  let o = 0;
  for (const p of parts) {
    if (o >= n) break;
    const take = Math.min(p.length, n - o);
    out.set(p.subarray(0, take), o);
    o += take;
  }
  return out;
}

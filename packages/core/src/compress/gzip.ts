/**
 * gzip (RFC 1952) through the platform's DecompressionStream('gzip') (WHATWG Compression Streams; a
 * global in Node >= 18 and in browsers). Multi-member files (members concatenated, RFC 1952 section
 * 2.2) are decoded as one stream by Node's implementation.
 */

/** First byte pair of a gzip member (RFC 1952 section 2.3.1: ID1 ID2). */
export const GZIP_MAGIC = [0x1f, 0x8b] as const;

/**
 * Streams gzip bytes into the decompressed bytes. A truncated or damaged stream is reported through
 * `onDamage` after the bytes decoded before it were delivered; errors thrown by the source pass through.
 */
export async function* gunzip(bytes: AsyncIterable<Uint8Array>, onDamage: (reason: string) => void): AsyncIterable<Uint8Array> {
  const it = bytes[Symbol.asyncIterator]();
  let sourceError: unknown = null;
  /** Set when the consumer stopped early: the source is stopped and the decompressor told the input ended. */
  let stopped = false;
  const input = new ReadableStream<Uint8Array>({
    async pull(controller) {
      if (stopped) {
        controller.close();
        return;
      }
      try {
        const r = await it.next();
        if (r.done) controller.close();
        else controller.enqueue(r.value);
      } catch (e) {
        sourceError = e;
        controller.error(e);
      }
    },
    async cancel() {
      await it.return?.();
    },
  });
  const reader = input.pipeThrough(new DecompressionStream('gzip') as unknown as ReadableWritablePair<Uint8Array, Uint8Array>).getReader();
  let finished = false;
  try {
    for (;;) {
      let r: ReadableStreamReadResult<Uint8Array>;
      try {
        r = await reader.read();
      } catch (e) {
        finished = true;
        if (sourceError !== null) throw sourceError;
        const msg = e instanceof Error ? e.message : String(e);
        onDamage(`gzip stream damaged or truncated (${msg})`);
        return;
      }
      if (r.done) {
        finished = true;
        return;
      }
      yield r.value;
    }
  } finally {
    // A consumer that stops early stops the source (a file behind it is closed now). The pipe is not
    // cancelled: cancelling Node 20's DecompressionStream while it holds decoded bytes throws from
    // inside Node ('Controller is already closed'); its input is ended instead and its output left unread.
    if (!finished) {
      stopped = true;
      await it.return?.();
    }
  }
}

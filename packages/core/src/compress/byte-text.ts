/**
 * The bytes behind a text stream of openText, for a reader that parses bytes (the observation reader,
 * rinex/byte-lines.ts): decoding every chunk to a string costs about as much as a bare line scan of the
 * text, and the reader's fields are digits it reads as well from the bytes.
 *
 * openText registers, for a plain (not compact RINEX) file, the byte stream its text is decoded from,
 * with the single-byte decoding the text uses. The bytes keep the file's line ends: CR LF and a lone CR
 * end a line as '\n' does (openText's text has them all as '\n'). A reader given
 * that very text stream may claim the bytes before the first chunk of text is pulled; the text stream
 * is then its own no longer (pulling it throws). Unclaimed, nothing changes.
 */

/** Bytes of a text stream: each byte is one character of the text under `decode`. */
export interface TextBytes {
  readonly chunks: AsyncIterable<Uint8Array>;
  /** The text's single-byte decoding (bytes of a line to its characters). */
  readonly decode: (bytes: Uint8Array) => string;
}

/** Whether a text stream was pulled or its bytes claimed (only one of the two may happen). */
interface ClaimState {
  started: boolean;
  claimed: boolean;
}

const claimable = new WeakMap<object, { readonly bytes: TextBytes; readonly state: ClaimState }>();

/**
 * The text stream decoded from `bytes` by `toText`, registered so that a reader may take the bytes
 * instead (claimTextBytes).
 */
export function textWithClaimableBytes(bytes: TextBytes, toText: (bytes: AsyncIterable<Uint8Array>) => AsyncIterable<string>): AsyncIterable<string> {
  const state: ClaimState = { started: false, claimed: false };
  const text = guarded(state, () => toText(bytes.chunks));
  claimable.set(text, { bytes, state });
  return text;
}

async function* guarded(state: ClaimState, open: () => AsyncIterable<string>): AsyncIterable<string> {
  if (state.claimed) throw new Error('this text stream was handed to a reader as bytes');
  state.started = true;
  yield* open();
}

/**
 * The bytes of `text` when it is openText's own stream of a plain file and none of it has been pulled
 * yet: from then on the bytes are the claimer's. null otherwise (read the text).
 */
export function claimTextBytes(text: AsyncIterable<string>): TextBytes | null {
  const r = claimable.get(text);
  if (r === undefined || r.state.started) return null;
  claimable.delete(text);
  r.state.claimed = true;
  return r.bytes;
}

/**
 * Frame names given by the user are checked against the frames the engine knows (core frames/frame-crs.ts):
 * a typo (ETRF2OOO) must not become a new frame that never compares equal to anything. A name outside
 * the list needs --allow-unknown-frame, and its outputs then carry no CRS (with a warning).
 */
import { KNOWN_FRAME_NAMES, isKnownFrameName, normaliseFrameName } from '@refdelta/core';
import { UsageError } from './usage-error.js';

export function requireKnownFrame(name: string, where: string, allowUnknown: boolean): string {
  if (allowUnknown || isKnownFrameName(name)) return name;
  throw new UsageError(
    `${where}: '${name}' is not a frame refdelta knows (${KNOWN_FRAME_NAMES.join(', ')}, or unstated); ` +
      `check the spelling, or give --allow-unknown-frame to use '${normaliseFrameName(name)}' as a label of its own`,
  );
}

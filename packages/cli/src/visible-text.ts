/**
 * Text from input files (a MARKER NAME, a comment, a file name) shown on a terminal: control
 * characters (C0 except line feed, DEL, C1) are written as \xNN so an escape sequence in an input
 * can neither move the cursor nor retitle the window (common practice, cf. ECMA-48 for what they do).
 */
// eslint-disable-next-line no-control-regex
const CONTROL = /[\u0000-\u0009\u000b-\u001f\u007f-\u009f]/g;

export function visible(text: string): string {
  return text.replace(CONTROL, (c) => (c === '\t' ? '\t' : `\\x${c.charCodeAt(0).toString(16).padStart(2, '0')}`));
}

/** A single line: line feeds escaped too. */
export function visibleLine(text: string): string {
  return visible(text).replace(/\n/g, '\\x0a');
}

/**
 * Typed errors and warnings. Every problem found in an input names the file, the line and what was
 * expected, so a user can open the file at that line and see it.
 */

/** A problem that stops reading (or processing) one input. */
export class RefdeltaError extends Error {
  override readonly name: string = 'RefdeltaError';
  constructor(message: string) {
    super(message);
  }
}

/** A file-level input error: names the file, the 1-based line number (0 when not line-specific) and what was expected. */
export class InputError extends RefdeltaError {
  override readonly name: string = 'InputError';
  constructor(
    readonly file: string,
    readonly line: number,
    readonly reason: string,
  ) {
    super(line > 0 ? `${file}:${line}: ${reason}` : `${file}: ${reason}`);
  }
}

/** The input is not the kind of file asked for (not RINEX, or a nav file given as obs). One clear sentence. */
export class FormatError extends InputError {
  override readonly name: string = 'FormatError';
}

/** Options or data that cannot be processed (frames that do not match, no overlap in time...). */
export class ProcessingError extends RefdeltaError {
  override readonly name: string = 'ProcessingError';
}

/** A non-fatal finding: processing goes on, the user is told. */
export interface Warning {
  readonly file?: string;
  /** 1-based line number in the (decompressed) text; 0 when not line-specific. */
  readonly line?: number;
  /** Short machine-readable key, e.g. 'missing-header-record', 'bad-epoch-skipped'. */
  readonly code: string;
  readonly message: string;
}

export type WarningSink = (w: Warning) => void;

export function formatWarning(w: Warning): string {
  const where = w.file ? (w.line ? `${w.file}:${w.line}: ` : `${w.file}: `) : '';
  return `${where}${w.message}`;
}

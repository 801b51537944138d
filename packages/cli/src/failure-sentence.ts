/** One clear sentence (and an exit code) for every way a run can fail. */
import { InputError, RefdeltaError } from '@refdelta/core/defaults-and-errors';
import { EXIT_PROCESSING, EXIT_USAGE } from './exit-codes.js';
import { UsageError } from './usage-error.js';

export interface Failure {
  readonly sentence: string;
  readonly exitCode: number;
}

function oneLine(s: string): string {
  return s.replace(/\s*[\r\n]+\s*/g, ' ').trim();
}

export function describeFailure(e: unknown): Failure {
  if (e instanceof UsageError) return { sentence: oneLine(e.message), exitCode: EXIT_USAGE };
  if (e instanceof InputError) {
    // Readers often name the file in the reason already: do not say it twice.
    const s = e.reason.includes(e.file) ? (e.line > 1 ? `${e.reason} (line ${e.line})` : e.reason) : e.message;
    return { sentence: oneLine(s), exitCode: EXIT_PROCESSING };
  }
  if (e instanceof RefdeltaError) return { sentence: oneLine(e.message), exitCode: EXIT_PROCESSING };
  const err = e as NodeJS.ErrnoException;
  if (err && typeof err === 'object' && typeof err.code === 'string' && /^E[A-Z]+$/.test(err.code)) {
    const what: Record<string, string> = {
      ENOENT: 'no such file or folder', EACCES: 'permission denied', EPERM: 'operation not permitted',
      ENOSPC: 'no space left on the device: free some space or choose another --out', EDQUOT: 'disk quota exceeded: free some space or choose another --out',
      EISDIR: 'is a folder, not a file', ENOTDIR: 'a part of the path is not a folder', EROFS: 'read-only file system: choose another --out',
      EEXIST: 'a file or folder of that name is in the way', EIO: 'input/output error of the device', EMFILE: 'too many open files',
      ENAMETOOLONG: 'the name is too long for the file system',
    };
    const where = typeof err.path === 'string' ? err.path : 'a file';
    return { sentence: `${where}: ${what[err.code] ?? `system error ${err.code}`}`, exitCode: EXIT_PROCESSING };
  }
  const msg = e instanceof Error ? e.message : String(e);
  return { sentence: `internal error: ${oneLine(msg)} (run again with --debug for the stack trace)`, exitCode: EXIT_PROCESSING };
}

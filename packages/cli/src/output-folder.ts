/**
 * The output folder, checked before any input is processed: it exists or can be made, it is a folder,
 * it is writable, no input would be overwritten by an output, and the file system has room for an
 * estimate of the outputs. Leftovers of an interrupted earlier run there are finished or removed first.
 */
import { constants as FS, realpathSync } from 'node:fs';
import { access, mkdir, open, rm, stat, statfs } from 'node:fs/promises';
import { basename, dirname, join, resolve, sep } from 'node:path';
import { ProcessingError, type Warning } from '@refdelta/core';
import { recoverOutputFolder, registerTemporary, releaseTemporary } from './output-commit.js';

/** Kernel file systems where Node's recursive mkdir can loop (it retries on an ENOENT that never clears). */
const KERNEL_FOLDERS = ['/proc', '/sys', '/dev'];

/** One sentence for a system error on the output folder (no raw error codes). */
export function outputFolderSentence(code: string | undefined, dir: string): string | null {
  switch (code) {
    case 'ENOSPC': return `no space left on the device holding the output folder ${dir}: free some space or choose another --out`;
    case 'EDQUOT': return `the disk quota is used up for the output folder ${dir}: free some space or choose another --out`;
    case 'EROFS': return `the output folder ${dir} is on a read-only file system: choose another --out`;
    case 'EACCES': case 'EPERM': return `no permission to write in the output folder ${dir}: choose another --out or change its permissions`;
    case 'EEXIST': case 'ENOTDIR': return `the output folder ${dir} cannot be made: a part of that path is an existing file, not a folder`;
    case 'ENAMETOOLONG': return `the output folder name ${dir} is too long for the file system`;
    default: return null;
  }
}

function fail(code: string | undefined, dir: string, fallback: string): never {
  throw new ProcessingError(outputFolderSentence(code, dir) ?? fallback);
}

/** Makes `dir` one level at a time (no recursive mkdir: see KERNEL_FOLDERS). */
export async function makeFolder(dir: string): Promise<void> {
  const missing: string[] = [];
  let p = dir;
  for (;;) {
    const st = await stat(p).catch((e: NodeJS.ErrnoException) => (e.code === 'ENOENT' ? null : fail(e.code, dir, `the output folder ${dir} cannot be made (${e.code})`)));
    if (st) {
      if (!st.isDirectory()) fail('ENOTDIR', dir, '');
      break;
    }
    missing.push(p);
    const up = dirname(p);
    if (up === p) break;
    p = up;
  }
  for (const m of missing.reverse()) {
    try {
      await mkdir(m);
    } catch (e) {
      const code = (e as NodeJS.ErrnoException).code;
      if (code === 'EEXIST' && (await stat(m).catch(() => null))?.isDirectory()) continue;
      fail(code, dir, `the output folder ${dir} cannot be made (${code})`);
    }
  }
}

function realOrSelf(p: string): string {
  try {
    return realpathSync(p);
  } catch {
    return resolve(p);
  }
}

export interface OutputFolderCheck {
  /** The folder (absolute). */
  readonly dir: string;
  /** Inputs that must not be overwritten. */
  readonly inputs: readonly string[];
  /** File names the run writes in `dir` (or in its subfolders, as relative paths). */
  readonly outputNames: readonly string[];
  /** Estimate of the bytes the outputs take. */
  readonly estimatedBytes: number;
  /** Option name for the sentences. */
  readonly option?: string;
}

/** What the check found that the caller should tell the user. */
export interface OutputFolderFindings {
  /** Inputs inside the output folder (or its subfolders): the outputs go beside them. */
  readonly inputsInside: readonly string[];
}

/** The inputs whose real path lies inside `dir` (an existing folder). */
export function inputsInsideFolder(dir: string, inputs: readonly string[]): string[] {
  const root = realOrSelf(dir);
  const prefix = root.endsWith(sep) ? root : root + sep;
  return [...new Set(inputs)].filter((p) => realOrSelf(p).startsWith(prefix));
}

/** The warning for outputs written beside inputs (none is overwritten: that is refused earlier). */
export function inputsInsideWarning(dir: string, inside: readonly string[], option = '--out'): Warning | null {
  if (!inside.length) return null;
  const names = inside.slice(0, 5).map((p) => basename(p)).join(', ') + (inside.length > 5 ? `, ... (${inside.length} in all)` : '');
  return {
    code: 'outputs-beside-inputs',
    message: `the output folder ${dir} (${option}) holds input file${inside.length > 1 ? 's' : ''} (${names}): the outputs are written beside ${inside.length > 1 ? 'them' : 'it'} (no input is overwritten); choose a folder of its own to keep outputs and inputs apart`,
  };
}

/**
 * Why files cannot be made in the existing folder `dir` (a system error code such as 'EACCES' or
 * 'EROFS', '' when the error has no code), null when they can: access(), then a probe file (a read-only mount passes access() for root).
 */
export async function folderWriteError(dir: string): Promise<string | null> {
  try {
    await access(dir, FS.W_OK | FS.X_OK);
  } catch (e) {
    return (e as NodeJS.ErrnoException).code ?? '';
  }
  // Unique per thread too: batch workers share the process id and may probe the same folder in one millisecond.
  const probe = join(dir, `.refdelta-probe.${process.pid}.${Date.now().toString(36)}.${Math.random().toString(36).slice(2, 10)}.tmp`);
  registerTemporary(probe);
  try {
    const fh = await open(probe, 'wx');
    await fh.close();
    return null;
  } catch (e) {
    return (e as NodeJS.ErrnoException).code ?? '';
  } finally {
    await rm(probe, { force: true }).catch(() => {});
    releaseTemporary(probe);
  }
}

/**
 * Checks (and makes) the output folder; finishes or removes what an interrupted earlier run left there.
 * An output that would replace an input is refused; inputs merely inside the folder are returned.
 */
export async function prepareOutputFolder(c: OutputFolderCheck): Promise<OutputFolderFindings> {
  const dir = resolve(c.dir);
  const option = c.option ?? '--out';
  if (KERNEL_FOLDERS.some((k) => dir === k || dir.startsWith(k + sep))) {
    throw new ProcessingError(`${option} ${dir} is inside ${KERNEL_FOLDERS.find((k) => dir === k || dir.startsWith(k + sep))}, a kernel file system, not a place for output files: choose another folder`);
  }
  const st = await stat(dir).catch(() => null);
  if (st && !st.isDirectory()) throw new ProcessingError(`${option} ${dir} is an existing file, not a folder: choose a folder name`);
  // A folder still to be made is made with the outputs (nothing is left by a run that fails): here
  // its nearest existing ancestor must be a writable folder.
  let there = dir;
  if (!st) {
    for (;;) {
      const up = dirname(there);
      const s = await stat(up).catch((e: NodeJS.ErrnoException) => (e.code === 'ENOENT' ? null : fail(e.code, dir, `the output folder ${dir} cannot be made (${e.code})`)));
      there = up;
      if (s) {
        if (!s.isDirectory()) fail('ENOTDIR', dir, '');
        break;
      }
      if (up === dirname(up)) break;
    }
  }
  const notWritable = await folderWriteError(there);
  if (notWritable !== null) fail(notWritable, dir, `the output folder ${dir} is not writable`);
  if (st) recoverOutputFolder(dir);
  const outs = new Map(c.outputNames.map((n) => [realOrSelf(join(dir, n)), n]));
  for (const input of c.inputs) {
    const hit = outs.get(realOrSelf(input));
    if (hit !== undefined) throw new ProcessingError(`the input ${input} is where the output ${hit} of ${option} ${dir} would be written: choose another output folder`);
  }
  try {
    const fs = await statfs(there);
    const free = Number(fs.bavail) * Number(fs.bsize);
    if (free < c.estimatedBytes) {
      throw new ProcessingError(`the output folder ${dir} has ${(free / 1e6).toFixed(1)} MB free, less than the about ${(c.estimatedBytes / 1e6).toFixed(1)} MB the outputs are estimated to take: free some space or choose another --out`);
    }
  } catch (e) {
    if (e instanceof ProcessingError) throw e;
    // statfs not supported here: the writes themselves report a full disk
  }
  return { inputsInside: st ? inputsInsideFolder(dir, c.inputs) : [] };
}

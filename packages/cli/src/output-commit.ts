/**
 * What makes an interrupted run leave nothing behind and an output set never half-described:
 *
 * - every temporary file of this process is registered while it exists; SIGINT and SIGTERM remove
 *   them and exit 130 / 143 (128 + the signal number, common practice for shells);
 * - the renames that publish an output set are first written to a journal beside it
 *   (`.refdelta-commit.<pid>.json`, itself written atomically). A signal during the renames finishes
 *   them; a harder kill (SIGKILL, power loss) leaves the journal, and the next run in that folder
 *   finishes them (every temporary file was fsynced before the journal was written);
 * - the next run also removes temporary files whose process is gone (names `.<file>.<pid>.<rand>.tmp`).
 */
import { closeSync, existsSync, fsyncSync, openSync, readdirSync, readFileSync, renameSync, rmSync, statSync, writeFileSync } from 'node:fs';
import { basename, dirname, join } from 'node:path';

/** Temporary files of this process that exist now. */
const liveTemporaries = new Set<string>();
/** Journals of commits under way in this process. */
const activeJournals = new Set<string>();

export function registerTemporary(path: string): void {
  installSignalHandlers();
  liveTemporaries.add(path);
}

export function releaseTemporary(path: string): void {
  liveTemporaries.delete(path);
}

/** Our temporary-file names: `.<name>.<pid>.<random>.tmp` (node-io.ts AtomicFile). */
const TEMPORARY_NAME = /^\..+\.(\d+)\.[0-9a-z]+\.tmp$/;
const JOURNAL_NAME = /^\.refdelta-commit\.(\d+)\.json$/;

export function temporaryName(finalPath: string): string {
  return join(dirname(finalPath), `.${basename(finalPath)}.${process.pid}.${Date.now().toString(36)}${Math.random().toString(36).slice(2, 8)}.tmp`);
}

interface Journal {
  readonly renames: readonly (readonly [string, string])[];
  readonly removes: readonly string[];
}

function processAlive(pid: number): boolean {
  if (pid === process.pid) return true;
  try {
    process.kill(pid, 0);
    return true;
  } catch (e) {
    return (e as NodeJS.ErrnoException).code === 'EPERM';
  }
}

function syncFolderNow(dir: string): void {
  try {
    const fd = openSync(dir, 'r');
    try { fsyncSync(fd); } finally { closeSync(fd); }
  } catch {
    // a folder that cannot be fsynced: the files themselves are synced
  }
}

/** Applies a journal's steps that are still to do (each step can be repeated safely), then drops it. */
function finishJournal(path: string, j: Journal): void {
  for (const p of j.removes) rmSync(p, { force: true });
  for (const [tmp, final] of j.renames) {
    if (existsSync(tmp)) renameSync(tmp, final);
    liveTemporaries.delete(tmp);
  }
  syncFolderNow(dirname(path));
  rmSync(path, { force: true });
  activeJournals.delete(path);
}

/**
 * Publishes sealed temporary files: `removes` (old members no longer in the set, and the old index)
 * go first, then the renames in order (the index last). Synchronous from the journal on, so an
 * interrupt handler never sees half of a step.
 */
export function commitWithJournal(dir: string, renames: readonly (readonly [string, string])[], removes: readonly string[]): void {
  const journalPath = join(dir, `.refdelta-commit.${process.pid}.json`);
  const tmp = temporaryName(journalPath);
  const j: Journal = { renames, removes };
  registerTemporary(tmp);
  const fd = openSync(tmp, 'wx');
  try {
    writeFileSync(fd, JSON.stringify(j));
    fsyncSync(fd);
  } finally {
    closeSync(fd);
  }
  renameSync(tmp, journalPath);
  releaseTemporary(tmp);
  activeJournals.add(journalPath);
  syncFolderNow(dir);
  try {
    finishJournal(journalPath, j);
  } catch (e) {
    // A step that cannot be done (e.g. a folder in the way): the rest is dropped; the old index is
    // already gone, so what is on disk is never described by a wrong one.
    for (const [t] of renames) {
      rmSync(t, { force: true });
      liveTemporaries.delete(t);
    }
    rmSync(journalPath, { force: true });
    activeJournals.delete(journalPath);
    throw e;
  }
}

/**
 * Brings a folder back to a described state after an earlier run was killed: unfinished commits are
 * finished from their journals, then temporary files of processes that are gone are removed. Looks
 * in `dir` and its immediate subfolders (batch session folders). Returns the number of files handled.
 */
export function recoverOutputFolder(dir: string): number {
  let n = 0;
  const folders = [dir];
  let names: string[];
  try {
    names = readdirSync(dir);
  } catch {
    return 0;
  }
  for (const name of names) {
    if (name.startsWith('.')) continue;
    try {
      if (statSync(join(dir, name)).isDirectory()) folders.push(join(dir, name));
    } catch {
      // gone or unreadable: nothing of ours to recover there
    }
  }
  for (const f of folders) {
    let entries: string[];
    try {
      entries = readdirSync(f);
    } catch {
      continue;
    }
    for (const e of entries) {
      const m = JOURNAL_NAME.exec(e);
      if (!m || processAlive(Number(m[1]))) continue;
      const path = join(f, e);
      try {
        finishJournal(path, JSON.parse(readFileSync(path, 'utf8')) as Journal);
      } catch {
        rmSync(path, { force: true });
      }
      n++;
    }
    for (const e of readdirSync(f)) {
      const m = TEMPORARY_NAME.exec(e);
      if (!m || processAlive(Number(m[1]))) continue;
      rmSync(join(f, e), { force: true });
      n++;
    }
  }
  return n;
}

let installed = false;

/** SIGINT / SIGTERM: finish a commit under way (its files are sealed), remove every other temporary file, exit 130 / 143. */
function installSignalHandlers(): void {
  if (installed) return;
  installed = true;
  const handler = (code: number) => () => {
    // Said only when outputs were being written (a process that is stopped between runs, such as a
    // test worker at its end, has nothing to say).
    const cleaning = activeJournals.size > 0 || liveTemporaries.size > 0;
    for (const path of [...activeJournals]) {
      try {
        finishJournal(path, JSON.parse(readFileSync(path, 'utf8')) as Journal);
      } catch {
        // the next run finishes it from the journal
      }
    }
    for (const t of liveTemporaries) rmSync(t, { force: true });
    liveTemporaries.clear();
    if (cleaning) process.stderr.write(`refdelta: interrupted; temporary files removed, earlier outputs left as they were\n`);
    process.exit(code);
  };
  process.on('SIGINT', handler(130));
  process.on('SIGTERM', handler(143));
}

/**
 * `refdelta report DIR`: one self-contained HTML page (report.html) from the outputs in DIR: a solve,
 * points or check folder gives a session page; a batch folder gives each session's page and an index
 * page linking them, failed sessions first. Each page is written atomically.
 */
import { existsSync } from 'node:fs';
import { readFile } from 'node:fs/promises';
import { dirname, join, relative, resolve } from 'node:path';
import { buildBatchIndexHtml, buildSessionReportHtml, CAUTIONS, InputError, ProcessingError, type BatchIndexEntry } from '@refdelta/core';
import { writeFileAtomic } from '../node-io.js';
import { folderWriteError } from '../output-folder.js';
import { folderTitle, readSessionReportData, sourcesInFolder, type ReportSources } from '../report-folder.js';
import type { Reporter } from '../reporter.js';
import { EXIT_OK } from '../exit-codes.js';
import { SOFTWARE } from '../software.js';

export const REPORT_FILE_NAME = 'report.html';
const BATCH_SUMMARY = 'batch-summary.json';

/** The session page's HTML from the given sources. */
export async function sessionReportHtml(src: ReportSources, title: string): Promise<string> {
  return buildSessionReportHtml(await readSessionReportData(src, title));
}

export interface BatchSessionRecord {
  readonly name: string;
  readonly status: string;
  readonly reason: string | null;
  readonly roverEpochs: number | null;
  readonly solvedEpochs: number | null;
  readonly points: number;
  /** The session's output folder (null when it failed). */
  readonly out: string | null;
}

/** The batch index page; sessions link to OUT/<session>/report.html when that exists or is being written. */
export function batchIndexHtml(outDir: string, title: string, sessions: readonly BatchSessionRecord[], hasReport: (s: BatchSessionRecord) => boolean): string {
  const entries: BatchIndexEntry[] = sessions.map((s) => ({
    session: s.name, status: s.status, reason: s.reason ?? '', epochs: s.roverEpochs ?? 0, solvedEpochs: s.solvedEpochs ?? 0, points: s.points,
    reportHref: s.out && hasReport(s) ? relative(outDir, join(s.out, REPORT_FILE_NAME)).split('\\').join('/') : null,
  }));
  return buildBatchIndexHtml({ title, software: `${SOFTWARE.name} ${SOFTWARE.version}`, createdUtc: new Date().toISOString(), sessions: entries, cautions: CAUTIONS });
}

/**
 * One sentence for a folder report.html cannot be written in (a system error code): the folder and what
 * to do, never a temporary file's name. report writes beside the outputs it reads, so the way out is the
 * folder's permissions or a writable copy of it.
 */
export function reportFolderSentence(code: string, dir: string): string {
  switch (code) {
    case 'EROFS': return `the folder ${dir} is on a read-only file system, so ${REPORT_FILE_NAME} cannot be written beside its outputs: copy the folder somewhere writable and run refdelta report on the copy`;
    case 'ENOSPC': case 'EDQUOT': return `no space left to write ${REPORT_FILE_NAME} in the folder ${dir}: free some space and run refdelta report again`;
    default: return `no permission to write ${REPORT_FILE_NAME} in the folder ${dir}: change the folder's permissions, or copy the folder somewhere writable and run refdelta report on the copy`;
  }
}

/** Every folder a page goes into must take a new file, checked before any page is written (output-folder.ts's probe). */
async function requireWritableFolders(dirs: readonly string[]): Promise<void> {
  for (const d of new Set(dirs)) {
    const code = await folderWriteError(d);
    if (code !== null) throw new ProcessingError(reportFolderSentence(code, d));
  }
}

const FOLDER_WRITE_CODES = new Set(['EACCES', 'EPERM', 'EROFS', 'ENOSPC', 'EDQUOT']);

async function writeReport(path: string, html: string, rep: Reporter): Promise<void> {
  let w;
  try {
    w = await writeFileAtomic(path, [html]);
  } catch (e) {
    const code = (e as NodeJS.ErrnoException).code;
    if (code !== undefined && FOLDER_WRITE_CODES.has(code)) throw new ProcessingError(reportFolderSentence(code, dirname(path)));
    throw e;
  }
  rep.event('output', { kind: 'report', path: w.path, bytes: w.bytes, sha256: w.sha256 });
  rep.info(`report: ${w.path} (${(w.bytes / 1024).toFixed(0)} KiB)`);
}

export async function runReport(dirArg: string, rep: Reporter): Promise<number> {
  const dir = resolve(dirArg);
  if (!existsSync(dir)) throw new InputError(dirArg, 0, `the output folder ${dirArg} does not exist`);
  rep.event('start', { command: 'report', dir });
  const batchPath = join(dir, BATCH_SUMMARY);
  if (existsSync(batchPath)) {
    let doc: { sessions?: unknown };
    try {
      doc = JSON.parse(await readFile(batchPath, 'utf8')) as { sessions?: unknown };
    } catch (e) {
      throw new InputError(batchPath, 0, `${batchPath} is not valid JSON (${e instanceof Error ? e.message : String(e)})`);
    }
    const sessions: BatchSessionRecord[] = (Array.isArray(doc.sessions) ? doc.sessions : []).map((s0: Record<string, unknown>) => ({
      name: String(s0.name ?? '?'), status: String(s0.status ?? '?'), reason: s0.reason === null || s0.reason === undefined ? null : String(s0.reason),
      roverEpochs: typeof s0.rover_epochs === 'number' ? s0.rover_epochs : null, solvedEpochs: typeof s0.solved_epochs === 'number' ? s0.solved_epochs : null,
      points: typeof s0.points === 'number' ? s0.points : 0,
      // The folder as written, else beside the batch summary (a batch folder that was moved).
      out: typeof s0.out === 'string' ? (existsSync(s0.out) ? s0.out : existsSync(join(dir, String(s0.name))) ? join(dir, String(s0.name)) : null) : null,
    }));
    await requireWritableFolders([dir, ...sessions.flatMap((s) => (s.out ? [s.out] : []))]);
    const written = new Set<string>();
    for (const s of sessions) {
      if (!s.out) continue;
      await writeReport(join(s.out, REPORT_FILE_NAME), await sessionReportHtml(sourcesInFolder(s.out), s.name), rep);
      written.add(s.name);
    }
    await writeReport(join(dir, REPORT_FILE_NAME), batchIndexHtml(dir, folderTitle(dir), sessions, (s) => written.has(s.name)), rep);
  } else {
    const src = sourcesInFolder(dir);
    if (!src.epochs && !src.residuals && !src.points && !src.summary && !src.check) {
      throw new InputError(dirArg, 0, `${dirArg} holds none of the outputs a report is built from (epochs.csv, residuals.csv, points.csv, summary.json, control-check.json, batch-summary.json)`);
    }
    await requireWritableFolders([dir]);
    await writeReport(join(dir, REPORT_FILE_NAME), await sessionReportHtml(src, folderTitle(dir)), rep);
  }
  rep.event('done', { exit_code: EXIT_OK });
  return EXIT_OK;
}

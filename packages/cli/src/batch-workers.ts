/**
 * The sessions of a batch run in parallel on worker threads (node:worker_threads), each worker one
 * session at a time. Each session's messages (stderr lines, --json-lines events) are held by its
 * worker and printed when the session's turn comes, and results are handed back in session order, so
 * the output files and the messages are those of a serial run. A worker's heap is bounded
 * (resourceLimits); a worker that dies (out of memory) fails its session with a sentence, and a
 * fresh worker takes the next one. With one job (or one session) everything runs in this thread.
 */
import { existsSync } from 'node:fs';
import { availableParallelism, totalmem } from 'node:os';
import { fileURLToPath } from 'node:url';
import { Worker } from 'node:worker_threads';
import { runBatchSession, type BatchSessionContext, type BatchSessionJob, type BatchSessionResult } from './commands/batch.js';
import type { PointsConfig } from './commands/points.js';
import type { Reporter } from './reporter.js';
import { UsageError } from './usage-error.js';

/** --jobs: a whole number >= 1; default the cores this process may use. */
export function parseJobs(value: unknown): number {
  if (value === undefined || value === null || value === '') return availableParallelism();
  const n = Number(value);
  if (!Number.isInteger(n) || n < 1 || n > 256) throw new UsageError(`--jobs must be a whole number from 1 to 256, got '${String(value)}'`);
  return n;
}

/**
 * Young generation of one worker (MiB): three semi-spaces of the size the command gives its main thread
 * (bin/heap-growth.js, YOUNG_SEMI_SPACE_MIB), so that a worker's memory does not grow with the length of
 * its sessions any more than the main thread's.
 */
export const WORKER_YOUNG_GENERATION_MIB = 3 * 8;

/** Heap limit of one worker (MiB): a share of the memory, at most V8's usual 4 GiB old space. */
export function workerHeapMiB(jobs: number): number {
  return Math.max(512, Math.min(4096, Math.floor(totalmem() / 2 ** 20 / (jobs + 1))));
}

/** Sent to a worker thread at start. */
export interface WorkerSetup {
  readonly context: BatchSessionContext;
  readonly quiet: boolean;
  readonly jsonLines: boolean;
}

/** A worker's answer for one session. */
export type WorkerAnswer =
  | { readonly index: number; readonly result: BatchSessionResult; readonly stdout: string; readonly stderr: string }
  | { readonly index: number; readonly usageError: string; readonly stdout: string; readonly stderr: string };

/**
 * The worker's script: the bundled one beside the bundled command (this module is then in dist/chunks/),
 * else the compiled module beside this one (dist/, unbundled).
 */
function workerScript(): URL {
  const bundled = new URL('../batch-worker-thread.mjs', import.meta.url);
  return existsSync(fileURLToPath(bundled)) ? bundled : new URL('./batch-worker-thread.js', import.meta.url);
}

/**
 * Runs every job, `jobs` at a time, and calls onResult for each in job order. A UsageError (same for
 * every session) stops the batch.
 */
export async function runBatchSessions(
  all: readonly BatchSessionJob[],
  context: BatchSessionContext,
  cfg: PointsConfig,
  rep: Reporter,
  jobs: number,
  onResult: (r: BatchSessionResult) => void,
): Promise<void> {
  const workers = Math.min(jobs, all.length);
  if (workers <= 1) {
    for (const job of all) onResult(await runBatchSession(job, context, cfg, rep));
    return;
  }
  const setup: WorkerSetup = { context, quiet: rep.quietMode, jsonLines: rep.jsonLinesMode };
  const answers = new Map<number, WorkerAnswer>();
  let nextToPrint = 0;
  let nextToStart = 0;
  let stopped: Error | null = null;
  const deliver = (): void => {
    for (let a = answers.get(nextToPrint); a !== undefined && stopped === null; a = answers.get(nextToPrint)) {
      answers.delete(nextToPrint);
      nextToPrint++;
      if (a.stdout) process.stdout.write(a.stdout);
      if (a.stderr) process.stderr.write(a.stderr);
      if ('usageError' in a) stopped = new UsageError(a.usageError);
      else onResult(a.result);
    }
  };
  const heapMiB = workerHeapMiB(workers);
  /** One worker thread taking jobs until none is left; a dead worker is replaced for the next job. */
  const lane = async (): Promise<void> => {
    while (nextToStart < all.length && stopped === null) {
      const worker = new Worker(workerScript(), { workerData: setup, resourceLimits: { maxOldGenerationSizeMb: heapMiB, maxYoungGenerationSizeMb: WORKER_YOUNG_GENERATION_MIB }, stdout: false, stderr: false });
      try {
        while (nextToStart < all.length && stopped === null) {
          const job = all[nextToStart++]!;
          const answer = await runOnWorker(worker, job, heapMiB);
          answers.set(job.index, answer);
          deliver();
          if ('failedWorker' in answer) break;
        }
      } finally {
        await worker.terminate();
      }
    }
  };
  await Promise.all(Array.from({ length: workers }, lane));
  if (stopped) throw stopped;
}

/** Sends one job and waits for its answer; a worker that exits or fails first gives a failed session. */
function runOnWorker(worker: Worker, job: BatchSessionJob, heapMiB: number): Promise<WorkerAnswer & { failedWorker?: true }> {
  return new Promise((resolveAnswer) => {
    const done = (a: WorkerAnswer & { failedWorker?: true }): void => {
      worker.off('message', onMessage);
      worker.off('error', onError);
      worker.off('exit', onExit);
      resolveAnswer(a);
    };
    const failed = (why: string): void => {
      const reason = `${job.file}: ${why}`;
      done({
        index: job.index, stdout: '', stderr: '', failedWorker: true,
        result: {
          record: { name: job.name, file: job.file, status: 'failed', reason, roverEpochs: null, solvedEpochs: null, points: 0, out: null, referenceFiles: [], navFiles: [] },
          columns: [], rows: [], problem: `session ${job.name} failed and was skipped: ${reason}`, projectionStatement: null, prjWkt: null,
        },
      });
    };
    const onMessage = (a: WorkerAnswer): void => done(a);
    const onError = (e: Error & { code?: string }): void =>
      failed(e.code === 'ERR_WORKER_OUT_OF_MEMORY' ? `the session needed more than the ${heapMiB} MiB of memory a worker may use: run it alone with --jobs 1` : `the worker thread failed (${e.message})`);
    const onExit = (code: number): void => failed(`the worker thread stopped (exit code ${code})`);
    worker.on('message', onMessage);
    worker.on('error', onError);
    worker.on('exit', onExit);
    worker.postMessage(job);
  });
}

/**
 * A batch worker thread (see batch-workers.ts): runs the sessions it is sent, one at a time, and
 * answers each with its result and the text its reporter printed, which this thread holds back
 * (its own process.stdout / process.stderr) so the main thread prints it in session order.
 */
import { parentPort, workerData } from 'node:worker_threads';
import { runBatchSession, type BatchSessionJob } from './commands/batch.js';
import { parsePointsConfig } from './commands/points.js';
import { Reporter } from './reporter.js';
import { UsageError } from './usage-error.js';
import type { WorkerAnswer, WorkerSetup } from './batch-workers.js';

const setup = workerData as WorkerSetup;
let stdout = '';
let stderr = '';
// This thread's streams only: what the reporter writes is held for the answer.
process.stdout.write = ((chunk: string | Uint8Array) => { stdout += String(chunk); return true; }) as typeof process.stdout.write;
process.stderr.write = ((chunk: string | Uint8Array) => { stderr += String(chunk); return true; }) as typeof process.stderr.write;

const a = setup.context.args;
const cfg = await parsePointsConfig({ ...a, rover: '', reference: [], nav: [] });
const rep = new Reporter({ quiet: setup.quiet, jsonLines: setup.jsonLines });

parentPort!.on('message', async (job: BatchSessionJob) => {
  let answer: WorkerAnswer;
  try {
    const result = await runBatchSession(job, setup.context, cfg, rep);
    answer = { index: job.index, result, stdout, stderr };
  } catch (e) {
    if (!(e instanceof UsageError)) throw e;
    answer = { index: job.index, usageError: e.message, stdout, stderr };
  }
  stdout = '';
  stderr = '';
  parentPort!.postMessage(answer);
});

#!/usr/bin/env node
/**
 * `npm run fuzz`: every reader gets >= 100,000 generated inputs (fuzz/targets.mjs), in worker processes
 * (one per core) with a heap limit; an input taking over 30 s counts as a hang, a worker killed by its
 * heap limit as out-of-memory. Then the CLI corpus of damaged real files (fuzz/cli-corpus.mjs).
 * Prints counts of crashes, hangs, out-of-memory and sentences naming neither file nor line, with the
 * seed and the time. Options: --count N (per reader), --seed S, --workers W, --heap-mb M, --no-cli, --only T.
 */
import { fork } from 'node:child_process';
import { cpus } from 'node:os';
import { dirname, join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { TARGETS } from './targets.mjs';
import { runCliCorpus } from './cli-corpus.mjs';

const HERE = dirname(fileURLToPath(import.meta.url));
const arg = (name, dflt) => {
  const i = process.argv.indexOf(`--${name}`);
  return i >= 0 ? process.argv[i + 1] : dflt;
};
const COUNT = Number(arg('count', 100000));
const SEED = Number(arg('seed', Math.floor(Math.random() * 2 ** 31)));
const WORKERS = Number(arg('workers', Math.max(1, Math.min(2, cpus().length))));
const HEAP_MB = Number(arg('heap-mb', 256));
const HANG_MS = 30_000;
const CHUNK = 5000;
const only = arg('only', null);

const targets = Object.keys(TARGETS).filter((t) => !only || only.split(',').includes(t));
const tally = Object.fromEntries(targets.map((t) => [t, { inputs: 0, ok: 0, named: 0, unnamed: 0, crash: 0, hang: 0, oom: 0, examples: [] }]));
const jobs = [];
for (const t of targets) for (let from = 0; from < COUNT; from += CHUNK) jobs.push({ target: t, seed: SEED, from, to: Math.min(COUNT, from + CHUNK) });

/** Runs one job to its end, restarting the worker after a hang or an out-of-memory kill (from the next input). */
function runJob(job) {
  return new Promise((resolve) => {
    const t = tally[job.target];
    const start = (from) => {
      if (from >= job.to) { resolve(); return; }
      let current = from;
      let lastMs = Date.now();
      let finished = false;
      const w = fork(join(HERE, 'worker.mjs'), [], { execArgv: [`--max-old-space-size=${HEAP_MB}`], stdio: ['ignore', 'ignore', 'pipe', 'ipc'] });
      let stderr = '';
      w.stderr.on('data', (b) => { stderr = (stderr + b.toString()).slice(-2000); });
      const timer = setInterval(() => {
        if (Date.now() - lastMs <= HANG_MS) return;
        finished = true;
        clearInterval(timer);
        t.hang++;
        t.examples.push({ index: current, outcome: 'hang' });
        w.kill('SIGKILL');
        start(current + 1);
      }, 1000);
      w.on('message', (m) => {
        lastMs = Date.now();
        if (m.ready) w.send({ ...job, from });
        else if (m.at !== undefined) current = m.at;
        else if (m.r !== undefined) {
          t[m.o]++;
          if (m.m !== undefined && t.examples.length < 50) t.examples.push({ index: m.r, outcome: m.o, message: m.m });
        } else if (m.done) {
          finished = true;
          clearInterval(timer);
          w.kill();
          resolve();
        }
      });
      w.on('exit', (code, signal) => {
        clearInterval(timer);
        if (finished) return;
        finished = true;
        // killed by its heap limit (V8 aborts: SIGABRT / exit 134) or died otherwise: the input at hand is counted
        const oom = /heap out of memory|Allocation failed/i.test(stderr) || signal === 'SIGABRT' || code === 134;
        t[oom ? 'oom' : 'crash']++;
        t.examples.push({ index: current, outcome: oom ? 'oom' : 'crash', message: stderr.slice(-300) });
        start(current + 1);
      });
    };
    start(job.from);
  });
}

const t0 = Date.now();
console.log(`refdelta fuzz: seed ${SEED}, ${COUNT} inputs per reader, ${targets.length} readers, ${WORKERS} workers, heap limit ${HEAP_MB} MB, hang limit ${HANG_MS / 1000} s`);
const queue = [...jobs];
await Promise.all(Array.from({ length: WORKERS }, async () => {
  for (let j = queue.shift(); j; j = queue.shift()) await runJob(j);
}));
let bad = 0;
for (const t of targets) {
  const x = tally[t];
  x.inputs = x.ok + x.named + x.unnamed + x.crash + x.hang + x.oom;
  bad += x.unnamed + x.crash + x.hang + x.oom;
  console.log(`${t.padEnd(14)} inputs ${String(x.inputs).padStart(7)}  read ${String(x.ok).padStart(7)}  refused with a named sentence ${String(x.named).padStart(7)}  crashes ${x.crash}  hangs ${x.hang}  out-of-memory ${x.oom}  unnamed sentences ${x.unnamed}`);
  for (const e of x.examples.slice(0, 5)) console.log(`    ${e.outcome} at index ${e.index}: ${e.message ?? ''}`);
}
console.log(`readers: ${((Date.now() - t0) / 1000).toFixed(0)} s`);
if (!process.argv.includes('--no-cli')) {
  const c = await runCliCorpus({ seed: SEED, workers: WORKERS, log: console.log });
  bad += c.crash + c.hang + c.unnamed;
}
console.log(`seed ${SEED}; total time ${((Date.now() - t0) / 1000).toFixed(0)} s; ${bad === 0 ? 'no crash, hang, out-of-memory or unnamed sentence' : `${bad} problem(s)`}`);
process.exitCode = bad === 0 ? 0 : 1;

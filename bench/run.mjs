// `npm run bench`: throughput and memory figures of the built engine (packages/core/dist), with targets.
//   Part 1: observation-reader MB/s on real day files (DGAR RINEX 2.11, BELE RINEX 3.05 after compact-RINEX
//           decode) against a bare line scan of the same text, and the compact-RINEX decode MB/s; run in
//           --reader-processes fresh processes (default 3), medians over them (bench/parse-run.mjs).
//   Part 2: engine on a simulated session (rover 1 Hz, reference 30 s, GPS + Galileo): end-to-end epochs/s,
//           the solve step alone, the two WLS implementations, and peak memory for 1 h and 24 h, each job
//           in a fresh child process (bench/engine-run.mjs).
//   Part 3: carrier phase (bench/carrier-run.mjs): a simulated day at 1 Hz, both passes.
//   Part 4: the HTML report of a full day at 1 Hz opened in chromium (bench/report-open.mjs); --part4 runs it alone, --no-report skips it.
//   Part 5: whole-process runs of the built command (start-up and outputs included) on real files and
//           simulated days beside floors measured in the same run (bench/whole-process.mjs,
//           bench/floor-solve.mjs): CPU time (user + system) and wall time, medians of --runs runs.
// A script, not a test. Options: --part1 ... --part5 (only one part), --hours-long N (default 24),
// --throughput-hours N (length of the simulated session timed end to end; default 24, a full day),
// --carrier-hours N (default 24), --no-carrier, --runs N (whole-process runs per figure, default 5),
// --reader-processes N (default 3).
import { fork } from 'node:child_process';
import { resolve } from 'node:path';
import os from 'node:os';
import { loadCore, ROOT } from './load-core.mjs';
import { SOLVE_SYSTEMS } from './parse-throughput.mjs';
import { benchWholeProcess } from './whole-process.mjs';
import { fmt, median, printTable } from './stats.mjs';
import { YOUNG_SEMI_SPACE_MIB } from '../packages/cli/bin/heap-growth.js';

// Engine jobs run with the young-generation bound the command starts with (packages/cli/bin/refdelta.js).
const ENGINE_NODE_FLAGS = ['--expose-gc', `--max-semi-space-size=${YOUNG_SEMI_SPACE_MIB}`];

const args = process.argv.slice(2);
const only = args.includes('--part1') ? 1 : args.includes('--part2') ? 2 : args.includes('--part3') ? 3 : args.includes('--part4') ? 4 : args.includes('--part5') ? 5 : 0;
const runsIdx = args.indexOf('--runs');
const runs = runsIdx >= 0 ? Number(args[runsIdx + 1]) : 5;
const longIdx = args.indexOf('--hours-long');
const longHours = longIdx >= 0 ? Number(args[longIdx + 1]) : 24;
const tpIdx = args.indexOf('--throughput-hours');
const throughputHours = tpIdx >= 0 ? Number(args[tpIdx + 1]) : 24;
const dataDir = resolve(ROOT, '..', 'shared', 'data');
const procIdx = args.indexOf('--reader-processes');
const readerProcesses = procIdx >= 0 ? Number(args[procIdx + 1]) : 3;
const verdicts = [];
const verdict = (what, value, target, pass) => verdicts.push([what, value, target, pass === null ? 'n/a' : pass ? 'PASS' : 'FAIL']);
const t0 = performance.now();

console.log(`refdelta bench: node ${process.version}, ${os.cpus().length} cores (${os.cpus()[0]?.model ?? '?'}), load average ${os.loadavg().map((l) => l.toFixed(1)).join(' ')}`);
console.log('Figures are medians of repeated runs after one warm-up; other processes on the machine slow them down.\n');

if (only === 0 || only === 1) {
  console.log('== Part 1: observation reader throughput (plain RINEX text held in memory, 64 KiB string chunks) ==');
  const perProcess = [];
  for (let i = 0; i < readerProcesses; i++) perProcess.push(await parseInFreshProcess());
  const results = combineParseRuns(perProcess);
  const rows = [['file', 'MB', 'lines', 'parser MB/s', 'best run MB/s', 'split MB/s', 'indexOf MB/s', 'bare scan used', 'parser/bare']];
  for (const r of results) {
    if (r.skipped) { console.log(`${r.name}: skipped (${r.skipped})`); continue; }
    rows.push([r.name, fmt(r.mb, 1), fmt(r.lines), fmt(r.parserMBs, 1), fmt(r.parserBestMBs, 1), fmt(r.splitMBs), fmt(r.scanMBs), r.bare.how, `${fmt(100 * r.ratio, 1)} %`]);
    verdict(`parser / bare scan from the text in memory, ${r.name.split(' ')[0]}`, `${fmt(100 * r.ratio, 1)} %`, '(string level, info)', null);
    verdict(`reader from bytes / Buffer latin1 + split floor, CPU, ${r.name.split(' ')[0]}`, `${fmt(100 * r.fromBytes.cpuRatio, 1)} % (${fmt(r.fromBytes.parserCpuMs)} vs ${fmt(r.fromBytes.bareCpuMs)} ms CPU; wall ${fmt(100 * r.fromBytes.ratio, 1)} %)`, '>= 40 %', r.fromBytes.cpuRatio >= 0.4);
    // the same figure when the reader parses only the values of the systems a solve asks for
    for (const [how, ms] of [[`solve's default systems ${SOLVE_SYSTEMS.default.join('')}`, r.fromBytes.defaultSystemsCpuMs], ['solve --systems G', r.fromBytes.gpsCpuMs]]) {
      const ratio = r.fromBytes.bareCpuMs / ms;
      verdict(`  same, values of ${how} only, ${r.name.split(' ')[0]}`, `${fmt(100 * ratio, 1)} % (${fmt(ms)} ms CPU)`, '>= 40 %', ratio >= 0.4);
    }
  }
  printTable(rows, [0, 7]);
  const byteRows = [['file', 'reader CPU ms', 'floor CPU ms', 'floor/reader (CPU)', 'reader MB/s (wall)', 'floor MB/s (wall)', 'floor/reader (wall)', 'JS byte pass CPU ms', 'floor/JS pass']];
  for (const r of results) if (!r.skipped) byteRows.push([r.name, fmt(r.fromBytes.parserCpuMs), fmt(r.fromBytes.bareCpuMs), `${fmt(100 * r.fromBytes.cpuRatio, 1)} %`, fmt(r.fromBytes.parserMBs, 1), fmt(r.fromBytes.bareMBs), `${fmt(100 * r.fromBytes.ratio, 1)} %`, fmt(r.fromBytes.jsPassCpuMs, 1), `${fmt(100 * r.fromBytes.bareCpuMs / r.fromBytes.jsPassCpuMs, 1)} %`]);
  console.log('From the bytes of the plain file (reader: openText with Buffer latin1 decoding + readObsStream on 64 KiB byte chunks, as the command line; floor: Buffer latin1 decode + split + count):');
  printTable(byteRows, [0]);
  console.log('JS byte pass: one loop reading every byte once from a Uint8Array (parses nothing): a JavaScript reader that looks at every character is at best near this share of the floor.');
  console.log(`The reader from bytes is timed reading every system's values (the figure above), and reading only the values of the systems a solve asks for (readObsStream's systems option, as refdelta solve passes its --systems: the default ${SOLVE_SYSTEMS.default.join('')}, and G alone); the other satellites are still handed out, with blank fields. Both rows are in the targets below.`);
  for (const r of results) {
    if (r.decode) console.log(`compact RINEX decode (openText on the gunzipped .crx, ${fmt(r.decode.crxMB, 1)} MB in -> ${fmt(r.mb, 1)} MB out): ${fmt(r.decode.decodeMBs, 1)} MB/s of plain output (median of ${r.decode.runs})`);
    if (r.decode?.fromCrx) {
      const c = r.decode.fromCrx;
      console.log(`reader from the .crx bytes (decoding included, as the command line): ${fmt(c.readerCpuMs)} ms CPU; floor on the same ${fmt(r.decode.crxMB, 1)} MB ${fmt(c.floorCpuMs)} ms: ${fmt(100 * c.cpuRatio, 1)} % (info)`);
    }
  }
  console.log('bare scan: the faster of split and an indexOf loop that makes every line a string (each is measured).');
  console.log(`Each figure above is the median over ${readerProcesses} fresh processes of each process's median (V8's optimisation decisions differ between processes). Reader from bytes, CPU ms per process:`);
  for (const r of results) if (!r.skipped) console.log(`  ${r.name.split(' ')[0]}: ${r.perProcessCpuMs.map((v) => fmt(v)).join(', ')} (floor ${r.perProcessFloorCpuMs.map((v) => fmt(v)).join(', ')})`);
  console.log('');
}

/** Part 1 in a fresh process (bench/parse-run.mjs), started as the command starts its engine. */
function parseInFreshProcess() {
  return new Promise((resolveRun, reject) => {
    const child = fork(resolve(ROOT, 'bench/parse-run.mjs'), [dataDir], { execArgv: ENGINE_NODE_FLAGS, stdio: ['ignore', 'inherit', 'inherit', 'ipc'] });
    let result = null;
    child.on('message', (m) => { result = m; });
    child.on('error', reject);
    child.on('exit', (code) => (result !== null ? resolveRun(result) : reject(new Error(`bench/parse-run.mjs exited ${code} without a result`))));
  });
}

/**
 * One part-1 result per file from the results of several processes: every timed figure is the median
 * of the processes' medians (each ratio recomputed from those); the reader's and the floor's CPU per
 * process are kept to show the spread.
 */
function combineParseRuns(perProcess) {
  return perProcess[0].map((first, i) => {
    if (first.skipped) return first;
    const runsOf = perProcess.map((p) => p[i]);
    const med = (pick) => median(runsOf.map(pick));
    const fromBytes = {
      parserMBs: med((r) => r.fromBytes.parserMBs), bareMBs: med((r) => r.fromBytes.bareMBs),
      parserCpuMs: med((r) => r.fromBytes.parserCpuMs), bareCpuMs: med((r) => r.fromBytes.bareCpuMs), jsPassCpuMs: med((r) => r.fromBytes.jsPassCpuMs),
      defaultSystemsCpuMs: med((r) => r.fromBytes.defaultSystemsCpuMs), gpsCpuMs: med((r) => r.fromBytes.gpsCpuMs),
    };
    const parserMBs = med((r) => r.parserMBs), splitMBs = med((r) => r.splitMBs), scanMBs = med((r) => r.scanMBs);
    const bare = splitMBs >= scanMBs ? { how: "text.split('\\n').length", mbs: splitMBs } : { how: 'indexOf loop + slice per line', mbs: scanMBs };
    const decode = first.decode ? {
      ...first.decode, decodeMBs: median(runsOf.map((r) => r.decode.decodeMBs)),
      fromCrx: { readerCpuMs: med((r) => r.decode.fromCrx.readerCpuMs), floorCpuMs: med((r) => r.decode.fromCrx.floorCpuMs), cpuRatio: med((r) => r.decode.fromCrx.floorCpuMs) / med((r) => r.decode.fromCrx.readerCpuMs) },
    } : undefined;
    return {
      ...first, parserMBs, parserBestMBs: Math.max(...runsOf.map((r) => r.parserBestMBs)), splitMBs, scanMBs, bare, ratio: parserMBs / bare.mbs,
      fromBytes: { ...fromBytes, ratio: fromBytes.parserMBs / fromBytes.bareMBs, cpuRatio: fromBytes.bareCpuMs / fromBytes.parserCpuMs },
      ...(decode ? { decode } : {}),
      perProcessCpuMs: runsOf.map((r) => r.fromBytes.parserCpuMs), perProcessFloorCpuMs: runsOf.map((r) => r.fromBytes.bareCpuMs),
    };
  });
}

/** Runs one engine job in a fresh process and returns what it sends back. */
function job(mode, hours) {
  return new Promise((resolveJob, reject) => {
    const child = fork(resolve(ROOT, 'bench/engine-run.mjs'), [mode, String(hours)], { execArgv: ENGINE_NODE_FLAGS, stdio: ['ignore', 'inherit', 'inherit', 'ipc'] });
    let result = null;
    child.on('message', (m) => { result = m; });
    child.on('error', reject);
    child.on('exit', (code) => (result !== null ? resolveJob(result) : reject(new Error(`engine-run ${mode} ${hours} h exited with code ${code} and no result`))));
  });
}

if (only === 0 || only === 2) {
  console.log('== Part 2: engine on a simulated session (rover 1 Hz, reference 30 s, GPS + Galileo, all error sources on) ==');
  const tp = await job('throughput', throughputHours);
  const s = tp.solve;
  printTable([
    ['measure', 'rate', 'how'],
    ['end to end', `${fmt(tp.epochsPerS)} epochs/s`, `read nav + reference + rover text from memory, solveSession, ${fmt(tp.epochs)} rover epochs (${tp.hours} h), median of ${tp.runsMs.length}`],
    ['solve step (iterated WLS + QC)', `${fmt(s.fixEpochsPerS)} epochs/s`, `solvePositionFix on ${fmt(s.epochs)} captured epochs (${fmt(s.meanSats, 1)} sats, ${fmt(s.meanIterations, 1)} iterations avg)`],
    ['QC loop, hand-written WLS', `${fmt(s.qcSmallEpochsPerS)} epochs/s`, 'qualityControlLoop, one linear problem per captured epoch'],
    ['QC loop, ml-matrix WLS', `${fmt(s.qcMlEpochsPerS)} epochs/s`, 'same problems, solver = solveWeightedLeastSquares'],
    ['WLS hand-written (solve/wls.ts)', `${fmt(s.wlsSmallPerS)} solves/s`, `${fmt(s.randomProblems)} random problems, m 6-20 (median ${s.randomMeanM}), n 4-5`],
    ['WLS ml-matrix', `${fmt(s.wlsMlPerS)} solves/s`, `same problems; largest difference in x ${s.wlsMaxDiffM.toExponential(1)} m`],
  ], [0, 2]);
  console.log(`replay check: ${fmt(100 * s.replayAgreement, 1)} % of captured epochs give the engine's satellites and position (largest difference ${s.replayMaxDiffM.toExponential(1)} m); ${s.snoopedEpochs} epochs had a satellite rejected by data snooping`);
  console.log(`solutions: ${JSON.stringify(tp.kinds)}; simulation + writing of the ${fmt(tp.textMB, 1)} MB of text took ${fmt(tp.generateMs / 1000, 1)} s (not timed)`);
  console.log(`hand-written WLS is ${fmt(s.wlsSmallPerS / s.wlsMlPerS, 1)}x the ml-matrix rate on the same problems\n`);
  verdict('end to end', `${fmt(tp.epochsPerS)} epochs/s`, '>= 5,000 epochs/s', tp.epochsPerS >= 5000);
  verdict('solve step', `${fmt(s.fixEpochsPerS)} epochs/s`, '>= 50,000 epochs/s', s.fixEpochsPerS >= 50000);
  const passes = tp.twoPassCpuMs / tp.onePassCpuMs;
  verdict('two passes / one pass (CPU)', `${fmt(passes, 2)}x (${fmt(tp.twoPassCpuMs / 1000, 1)} s / ${fmt(tp.onePassCpuMs / 1000, 1)} s)`, '<= 1.6x', passes <= 1.6);

  const short = await job('memory', 1);
  const long = await job('memory', longHours);
  printTable([
    ['session (streamed: simulate -> write -> read -> solve)', 'epochs', 'wall s', 'peak RSS MB', 'kernel max RSS MB', 'peak heap MB'],
    ...[short, long].map((m) => [`${m.hours} h`, fmt(m.epochs), fmt(m.wallMs / 1000, 1), fmt(m.peakRssMB, 1), fmt(m.kernelMaxRssMB, 1), fmt(m.peakHeapMB, 1)]),
  ]);
  console.log('heap = V8 used heap, sampled every 100 epochs; RSS sampled likewise and the kernel high-water mark (resourceUsage().maxRSS).\n');
  const rssRatio = long.kernelMaxRssMB / short.kernelMaxRssMB, heapRatio = long.peakHeapMB / short.peakHeapMB;
  verdict(`peak RSS ${longHours} h / 1 h (two passes)`, `${fmt(rssRatio, 2)}x`, '<= 1.3x', rssRatio <= 1.3);
  verdict(`peak heap ${longHours} h / 1 h`, `${fmt(heapRatio, 2)}x`, '<= 1.5x', heapRatio <= 1.5);
}

if (only !== 1 && only !== 4 && only !== 5 && !args.includes('--no-carrier')) {
  const cIdx = args.indexOf('--carrier-hours');
  const carrierHours = cIdx >= 0 ? Number(args[cIdx + 1]) : 24;
  console.log(`== Part 3: carrier phase on a simulated session (${carrierHours} h, rover 1 Hz, reference 30 s, GPS + GLONASS) ==`);
  const c = await new Promise((res, rej) => {
    const child = fork(resolve(ROOT, 'bench/carrier-run.mjs'), [String(carrierHours)], { execArgv: ENGINE_NODE_FLAGS, stdio: ['ignore', 'inherit', 'inherit', 'ipc'] });
    let out = null;
    child.on('message', (m) => { out = m; });
    child.on('error', rej);
    child.on('exit', (code) => (out ? res(out) : rej(new Error(`carrier-run exited with code ${code} and no result`))));
  });
  const pct = (p) => `${fmt(100 * p.fixed / c.epochs, 1)} %`;
  console.log(`${fmt(c.epochs)} rover epochs: read + records + forward + backward + combination in ${fmt(c.wallMs / 1000, 1)} s wall, ${fmt(c.cpuMs / 1000, 1)} s CPU; fixed forward ${pct(c.forward)}, backward ${pct(c.backward)}, combined ${pct(c.combined)}; records ${fmt(c.recordMB, 1)} MB; peak RSS ${fmt(c.peakRssMB, 0)} MB\n`);
  verdict(`carrier phase, ${carrierHours} h at 1 Hz, both passes (CPU)`, `${fmt(c.cpuMs / 1000, 1)} s`, '<= 60 s for 24 h', carrierHours === 24 ? c.cpuMs <= 60000 : null);
}

if ((only === 0 || only === 4) && !args.includes('--no-report')) {
  console.log('== Part 4: HTML report of a full day at 1 Hz opened in chromium ==');
  const { benchReportOpen } = await import('./report-open.mjs');
  const r = await benchReportOpen();
  if (r.skipped) console.log(`skipped: ${r.skipped}\n`);
  else {
    console.log(`page ${fmt(r.bytes / 1048576, 2)} MB built in ${fmt(r.buildMs)} ms; open (navigation to first frame after load) median ${fmt(r.openMs)} ms, range ${fmt(r.minMs)}-${fmt(r.maxMs)} ms over ${r.runs} openings\n`);
    verdict('report of a day at 1 Hz: opening in chromium', `${fmt(r.openMs)} ms`, '< 3,000 ms', r.openMs < 3000);
    verdict('report of a day at 1 Hz: file size', `${fmt(r.bytes / 1048576, 2)} MB`, '< 2 MB', r.bytes < 2 * 1048576);
  }
}

if (only === 0 || only === 5) {
  console.log(`== Part 5: whole-process runs of the refdelta command beside floors (CPU = user + system s; medians of ${runs} runs) ==`);
  const core = await loadCore();
  const p3 = await benchWholeProcess(core, dataDir, { runs, simHours: throughputHours });
  if (p3.skipped) console.log(`skipped: ${p3.skipped}`);
  else {
    printTable([['run', 'CPU s', 'wall s', 'peak RSS MB', 'floor', 'floor CPU s', 'ratio (CPU)', 'target'], ...p3.rows], [0, 4]);
    for (const [what, c] of p3.cases) console.log(`floor on ${what}: ${JSON.stringify(c.floorInfo)}`);
    console.log('floor script: bench/floor-solve.mjs (GPS only, as refdelta is asked with --systems G; writes the bytes refdelta wrote).\n');
    for (const v of p3.verdicts) verdict(v[0], v[1], v[2], v[3]);
  }
}

console.log('== Targets ==');
printTable([['measure', 'value', 'target', 'result'], ...verdicts]);
console.log(`\nbench took ${fmt((performance.now() - t0) / 1000, 0)} s`);

// Part 2 worker, run in a fresh child process by bench/run.mjs (child_process.fork), one job per process:
//   node bench/engine-run.mjs throughput <hours>   text generated in memory first, then read + solve timed
//   node bench/engine-run.mjs memory <hours>       generation streamed into read + solve; peak memory sampled
// The result is sent to the parent (process.send) or printed as one JSON line when run by hand.
import v8 from 'node:v8';
import { limitHeapGrowth } from '../packages/cli/bin/heap-growth.js';
import { loadCore } from './load-core.mjs';
import { asAsync, benchScenarioSpec, memoryChunks, scenarioTexts, SESSION_SYSTEMS } from './scenario.mjs';
import { captureProblem, benchSolveStep } from './solve-step.mjs';
import { median } from './stats.mjs';

// The engine's heap as the refdelta command has it (old generation grown to 1.2 times its live part).
limitHeapGrowth();
const [mode = 'throughput', hoursArg = '1'] = process.argv.slice(2);
const hours = Number(hoursArg);
const core = await loadCore();
const sim = core.simulateScenario(benchScenarioSpec(core, Math.round(hours * 3600)));
const texts = scenarioTexts(core, sim);
const options = core.withDefaults({ systems: SESSION_SYSTEMS });

/**
 * read (nav, reference, rover) + solveSession over the whole stream; `onEpoch` sees each solution. With
 * `again` (a function giving fresh rover and reference chunks) the session reads its inputs twice, as the
 * CLI has it (whole-session estimates in a first pass).
 */
async function session(rover, reference, nav, onEpoch, again) {
  const navData = await core.readNav('bench.nav', nav);
  const roverStream = await core.readObsStream('bench-rover.obs', rover);
  const refStream = await core.readObsStream('bench-reference.obs', reference);
  const reopen = again ? async () => {
    const c = again();
    return { rover: await core.readObsStream('bench-rover.obs', c.rover), references: [await core.readObsStream('bench-reference.obs', c.reference)] };
  } : undefined;
  const run = await core.solveSession({ rover: roverStream, references: [refStream], nav: navData, ...(reopen ? { reopen } : {}) }, options);
  let epochs = 0;
  const kinds = {};
  for await (const e of run.epochs) {
    epochs++;
    kinds[e.kind] = (kinds[e.kind] ?? 0) + 1;
    onEpoch?.(e, epochs);
  }
  return { epochs, kinds };
}

async function throughput() {
  const t0 = performance.now();
  const text = { rover: [...texts.rover()].join(''), reference: [...texts.reference()].join(''), nav: [...texts.nav()].join('') };
  const generateMs = performance.now() - t0;
  const fromMemory = (onEpoch) => session(memoryChunks(text.rover), memoryChunks(text.reference), memoryChunks(text.nav), onEpoch);
  const problems = [];
  const first = await fromMemory((e) => { const p = captureProblem(core, e); if (p) problems.push(p); }); // warm-up + capture
  const runsMs = [];
  // A full day is long enough that one timed run after the warm-up is representative.
  for (let i = 0; i < (hours > 6 ? 1 : 3); i++) {
    globalThis.gc?.();
    const t = performance.now();
    await fromMemory();
    runsMs.push(performance.now() - t);
  }
  const solve = await benchSolveStep(core, problems);
  // One pass against two (the CLI's default): CPU time, medians of 3.
  const cpuOf = async (again) => {
    const out = [];
    for (let i = 0; i < 3; i++) {
      globalThis.gc?.();
      const c0 = process.cpuUsage();
      await session(memoryChunks(text.rover), memoryChunks(text.reference), memoryChunks(text.nav), undefined, again);
      const c = process.cpuUsage(c0);
      out.push((c.user + c.system) / 1000);
    }
    return median(out);
  };
  const onePassCpuMs = await cpuOf(undefined);
  const twoPassCpuMs = await cpuOf(() => ({ rover: memoryChunks(text.rover), reference: memoryChunks(text.reference) }));
  return {
    mode, hours, generateMs, textMB: (text.rover.length + text.reference.length + text.nav.length) / 1e6,
    epochs: first.epochs, kinds: first.kinds, runsMs, epochsPerS: first.epochs / median(runsMs) * 1000, solve, onePassCpuMs, twoPassCpuMs,
  };
}

async function memory() {
  let peakRss = 0, peakHeap = 0, samples = 0;
  const sample = () => {
    samples++;
    const rss = process.memoryUsage.rss();
    const heap = v8.getHeapStatistics().used_heap_size;
    if (rss > peakRss) peakRss = rss;
    if (heap > peakHeap) peakHeap = heap;
  };
  sample();
  const t = performance.now();
  // Two passes, as the CLI runs a session: the inputs are generated (streamed) again for the second.
  const r = await session(asAsync(texts.rover()), asAsync(texts.reference()), asAsync(texts.nav()), (_, n) => { if (n % 100 === 0) sample(); },
    () => ({ rover: asAsync(texts.rover()), reference: asAsync(texts.reference()) }));
  const wallMs = performance.now() - t;
  sample();
  // resourceUsage().maxRSS is the kernel's high-water mark (KiB): catches peaks between samples.
  return { mode, hours, epochs: r.epochs, kinds: r.kinds, wallMs, samples, peakRssMB: peakRss / 2 ** 20, kernelMaxRssMB: process.resourceUsage().maxRSS / 1024, peakHeapMB: peakHeap / 2 ** 20 };
}

const result = mode === 'memory' ? await memory() : await throughput();
if (process.send) process.send(result);
else console.log(JSON.stringify(result));

// Carrier-phase worker, run in a fresh child process by bench/run.mjs (or by hand):
//   node bench/carrier-run.mjs <hours>
// The bench scenario (bench/scenario.mjs: rover 1 Hz, reference 30 s, GPS + GLONASS) is written to RINEX
// text in memory first
// (not timed); then reading the three texts and solveCarrierSession (records, forward pass, backward pass,
// combination, every epoch yielded) is timed once: wall time and the process's CPU time (user + system),
// the latter being what one core spends whatever else runs on the machine. The result goes to the parent (process.send) or is
// printed as one JSON line.
import { loadCore } from './load-core.mjs';
import { benchScenarioSpec, memoryChunks, scenarioTexts, CARRIER_SYSTEMS } from './scenario.mjs';

const hours = Number(process.argv[2] ?? '1');
const core = await loadCore();
// Every simulated error on, the zenith wet delay error at 2 mm (its difference between the receivers
// follows the simulator's field: millimetres over a short baseline), as in earlier runs of this bench.
// Both receivers report one type, so the engine fixes GLONASS ambiguities too (its 'auto' rule): the
// heavier integer search. No inter-channel biases are simulated (a switch of their own, off here).
const base = benchScenarioSpec(core, Math.round(hours * 3600), undefined, CARRIER_SYSTEMS);
const spec = { ...base, reference: { ...base.reference, receiverType: 'SIM BENCH RECEIVER' }, rover: { ...base.rover, receiverType: 'SIM BENCH RECEIVER' } };
const sim = core.simulateScenario({ ...spec, errors: { ...core.ALL_ERRORS_ON, tropo: { zenithWetSigmaM: 0.002, minPeriodS: 1800, maxPeriodS: 6 * 3600 } } });
const texts = scenarioTexts(core, sim);
const t0 = performance.now();
const text = { rover: [...texts.rover()].join(''), reference: [...texts.reference()].join(''), nav: [...texts.nav()].join('') };
const generateMs = performance.now() - t0;
const options = core.withDefaults({ systems: CARRIER_SYSTEMS, reference: { position: { ecef: sim.truth.referenceMark, frame: sim.truth.frame } }, reduceToMark: false });

globalThis.gc?.();
const t = performance.now();
const cpu0 = process.cpuUsage();
const run = await core.solveCarrierSession(async () => ({
  rover: await core.readObsStream('bench-rover.obs', memoryChunks(text.rover)),
  references: [await core.readObsStream('bench-reference.obs', memoryChunks(text.reference))],
  nav: await core.readNav('bench.nav', memoryChunks(text.nav)),
}), options, core.withCarrierDefaults({}));
let epochs = 0;
for await (const e of run.epochs) { epochs++; void e; }
const wallMs = performance.now() - t;
const cpu = process.cpuUsage(cpu0);
const cpuMs = (cpu.user + cpu.system) / 1000;
const s = run.summary();
const result = {
  hours, epochs, wallMs, cpuMs, generateMs, textMB: (text.rover.length + text.reference.length + text.nav.length) / 1e6,
  forward: s.forward, backward: s.backward, combined: s.combined, recordMB: s.recordBytes / 1e6,
  peakRssMB: process.resourceUsage().maxRSS / 1024,
};
if (process.send) process.send(result); else console.log(JSON.stringify(result));

/**
 * `npm run demo`: solves the bundled invented demo scenario (fixtures/demo/, see its README) into
 * out/demo/ and prints where the outputs went and how they compare with the demo truth.
 */
import { existsSync } from 'node:fs';
import { readFile } from 'node:fs/promises';
import { dirname, join, relative, resolve } from 'node:path';
import { fileURLToPath } from 'node:url';
import { runSolve } from './commands/solve.js';
import { runInspect } from './commands/inspect.js';
import { runPoints } from './commands/points.js';
import { runCheck } from './commands/check.js';
import { EXIT_CHECK_FAILED } from './exit-codes.js';
import { compareWithTruth, readCommentedCsv, readTruth } from './demo-compare.js';
import { describeFailure } from './failure-sentence.js';
import { Reporter } from './reporter.js';

const ROOT = resolve(dirname(fileURLToPath(import.meta.url)), '..', '..', '..');
const DEMO = join(ROOT, 'fixtures', 'demo');
const OUT = join(ROOT, 'out', 'demo');
const FILES = {
  reference: join(DEMO, 'KFRD-reference-5s.obs'),
  rover: join(DEMO, 'rover-1s.obs'),
  nav: join(DEMO, 'broadcast-mixed.nav'),
  truth: join(DEMO, 'rover-truth.csv'),
  marks: join(DEMO, 'control-marks.csv'),
};

/** The arguments the demo runs with (also shown in README.md). */
export function demoArgs(outDir: string) {
  return {
    rover: FILES.rover, reference: [FILES.reference], nav: [FILES.nav], out: outDir,
    refCoord: 'KFRD', marks: FILES.marks,
    // The demo truth is the antenna reference point: report the ARP to compare like with like.
    atAntenna: true,
    // The epoch-by-epoch step shows the code engine (its figures are in README.md); the points, carrier phase.
    carrierPhase: 'off',
  };
}

const m = (x: number): string => (Number.isFinite(x) ? `${x.toFixed(3)} m` : '-');

async function demo(): Promise<number> {
  const missing = Object.values(FILES).filter((f) => !existsSync(f));
  if (missing.length) {
    process.stderr.write(`refdelta demo: the demo files are not there yet (${missing.map((f) => relative(ROOT, f)).join(', ')})\n`);
    const present = Object.values(FILES).filter((f) => existsSync(f) && /\.(obs|nav)$/.test(f));
    if (present.length) await runInspect(present, true, new Reporter({ quiet: false, jsonLines: false }));
    return 1;
  }
  const rep = new Reporter({ quiet: false, jsonLines: false, maxPrintedWarnings: 5 });
  process.stderr.write(`refdelta demo: solving ${relative(ROOT, FILES.rover)} against ${relative(ROOT, FILES.reference)} (mark KFRD)\n`);
  const r = await runSolve(demoArgs(OUT), rep);
  process.stdout.write(`\noutputs written to ${relative(ROOT, OUT)}/:\n`);
  for (const o of r.outputs) process.stdout.write(`  ${relative(ROOT, o.path)}${o.bytes ? ` (${o.bytes} bytes)` : ''}\n`);
  const epochs = readCommentedCsv(await readFile(join(OUT, 'epochs.csv'), 'utf8'));
  const truth = readTruth(await readFile(FILES.truth, 'utf8'));
  const c = compareWithTruth(epochs, truth);
  process.stdout.write(`\nagainst the demo truth (antenna reference point), ${c.matched} differential epochs:\n`);
  process.stdout.write(`  all epochs     horizontal median ${m(c.all.horizontalMedianM)}, 95th percentile ${m(c.all.horizontal95M)}; vertical median ${m(c.all.verticalMedianM)}, 95th percentile ${m(c.all.vertical95M)}\n`);
  process.stdout.write(`  static epochs  horizontal median ${m(c.staticOnly.horizontalMedianM)}, 95th percentile ${m(c.staticOnly.horizontal95M)}; vertical median ${m(c.staticOnly.verticalMedianM)}, 95th percentile ${m(c.staticOnly.vertical95M)} (${c.staticOnly.count} epochs)\n`);
  if (r.exitCode !== 0) return r.exitCode;

  // The deliverable: one coordinate per occupied point (occupations from the rover file's event flags,
  // antenna heights from its header records, reduced to the ground marks), in UTM with EGM96 heights,
  // from carrier phase with integer ambiguities (centimetres); then the check against the published marks.
  const pointsOut = join(OUT, 'points');
  process.stderr.write(`\nrefdelta demo: averaging the occupied points into ${relative(ROOT, pointsOut)}/\n`);
  const pointsArgs = { ...demoArgs(pointsOut), atAntenna: false, carrierPhase: 'on', projection: 'utm', geoid: 'egm96', outputs: 'summary' };
  const p = await runPoints(pointsArgs, rep);
  if (p !== 0) return p;
  const pts = readCommentedCsv(await readFile(join(pointsOut, 'points.csv'), 'utf8'));
  const truePoints = readCommentedCsv(await readFile(join(DEMO, 'points.csv'), 'utf8'));
  process.stdout.write(`\npoints (ground marks, carrier phase) against the demo's true marks:\n`);
  for (const row of pts) {
    const t = truePoints.find((x) => x.name === row.name);
    if (!t) continue;
    const d = [Number(row.ecef_x_m) - Number(t.x_m), Number(row.ecef_y_m) - Number(t.y_m), Number(row.ecef_z_m) - Number(t.z_m)];
    process.stdout.write(`  ${row.name.padEnd(10)} ${String(row.epochs).padStart(4)} ${(row.solution_basis ?? '').padEnd(11)} epochs  3-D error ${m(Math.hypot(d[0], d[1], d[2]))}  (95 % radius ${m(Number(row.radius95_relative_m))}; sigma of the mean E/N/U ${m(Number(row.sigma_mean_east_m))} / ${m(Number(row.sigma_mean_north_m))} / ${m(Number(row.sigma_mean_up_m))})\n`);
  }
  const checkOut = join(OUT, 'check');
  process.stderr.write(`\nrefdelta demo: checking the points against the published marks of ${relative(ROOT, FILES.marks)}\n`);
  const c2 = await runCheck({ points: join(pointsOut, 'points.csv'), marks: FILES.marks, out: checkOut, toleranceH: '1.0', toleranceV: '2.0' }, rep);
  process.stdout.write(`\ncontrol check: ${c2 === 0 ? 'every matched mark within tolerance' : c2 === EXIT_CHECK_FAILED ? 'a mark FAILED its tolerance' : 'failed'}; report in ${relative(ROOT, checkOut)}/control-check.csv\n`);
  process.stdout.write('\n(invented scenario, simulated data: see fixtures/demo/README.md)\n');
  process.stdout.write('Results are for mapping-grade work: verify them on control points, and defer to local codes and licensed surveyors.\n');
  return c2 === EXIT_CHECK_FAILED ? 0 : c2;
}

demo().then(
  (code) => { process.exitCode = code; },
  (e: unknown) => {
    const f = describeFailure(e);
    process.stderr.write(`refdelta demo: ${f.sentence}\n`);
    process.exitCode = f.exitCode;
  },
);

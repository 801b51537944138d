/**
 * refdelta: differential GNSS pseudorange post-processing from RINEX files. This module is the CLI's
 * library entry: importing it runs nothing; `main(argv)` runs a command line and returns its exit code
 * (bin/refdelta.js calls runFromProcess()).
 * Exit codes: 0 ok, 1 reading or processing failed, 2 wrong command line, 3 a control mark failed
 * (check), 4 some sessions of a batch failed (see exit-codes.ts, README.md).
 */
import yargs from 'yargs';
import { DEFAULT_CHECK_TOLERANCE_H_M, DEFAULT_CHECK_TOLERANCE_V_M, DEFAULT_MATCH_RADIUS_M } from '@refdelta/core/defaults-and-errors';
import { hideBin } from 'yargs/helpers';
// Each command's module is imported when that command runs (`--version`, `--help` and a wrong command
// line load none of them): the bundle splits them into chunks of their own (scripts/bundle.mjs).
import type { SolveArgs } from './commands/solve.js';
import type { PointsArgs } from './commands/points.js';
import type { CheckArgs } from './commands/check.js';
import type { BatchArgs } from './commands/batch.js';
import { defineCarrierOptions } from './carrier-option-definitions.js';
import { defineProcessingOptions, definePointsOptions, defineSolveOptions, pointsArgsFrom, solveArgsFrom } from './solve-option-definitions.js';
import { describeFailure } from './failure-sentence.js';
import { unknownOptionSentence } from './option-suggestion.js';
import { EXIT_OK, EXIT_USAGE } from './exit-codes.js';
import { Reporter } from './reporter.js';
import { UsageError } from './usage-error.js';
import { SOFTWARE } from './software.js';
import { visibleLine } from './visible-text.js';

// Examples use the invented demo scenario only (fixtures/demo: Kestrelford, mark KFRD).
const D = 'fixtures/demo';
const DEMO_FILES = `--rover ${D}/rover-1s.obs --reference ${D}/KFRD-reference-5s.obs --nav ${D}/broadcast-mixed.nav`;
const SOLVE_EXAMPLES: readonly [string, string][] = [
  [`refdelta solve ${DEMO_FILES} --ref-coord 4297138.9472,662577.7978,4651416.4719 --ref-frame WGS84 --ref-epoch 2024.3672 --out out/run1`, 'reference mark as ECEF metres, with its frame and epoch'],
  [`refdelta solve ${DEMO_FILES} --ref-coord 47.123456,8.765432,412.345 --ref-frame WGS84 --ref-epoch 2024.3672 --elevation-mask 15 --smooth 100 --out out/run2`, 'latitude, longitude, ellipsoidal height; 15 deg mask, 100 s carrier smoothing'],
  [`refdelta solve ${DEMO_FILES} --ref-coord KFRD --marks ${D}/control-marks.csv --out out/run3`, 'a mark named in a control list (frame and epoch from the list)'],
  [`refdelta solve ${DEMO_FILES} --ref-coord header --rover-antenna-height 1.5 --out out/run4`, "the reference file's header coordinate (approximate; frame unstated)"],
  [`refdelta solve --rover ${D}/rover-1s.obs --nav ${D}/broadcast-mixed.nav --out out/alone`, 'no reference: single-receiver (standalone) positions in the broadcast orbits\' frame'],
];

/** Options whose values may start with a minus sign (coordinates): joined as --opt=value so they are not read as flags. */
const SIGNED_VALUE_OPTIONS = new Set(['--ref-coord', '--ref-epoch', '--ref-antenna-height', '--rover-antenna-height', '--slant-offset']);

export function joinSignedValues(argv: readonly string[]): string[] {
  const out: string[] = [];
  for (let i = 0; i < argv.length; i++) {
    const a = argv[i];
    const next = argv[i + 1];
    if (SIGNED_VALUE_OPTIONS.has(a) && next !== undefined && /^-[\d.]/.test(next)) {
      out.push(`${a}=${next}`);
      i++;
    } else {
      out.push(a);
    }
  }
  return out;
}

/** A reader that stops early (`| head -1`) closes the pipe: end quietly instead of with a stack trace. */
function quietOnClosedPipe(stream: NodeJS.WriteStream): void {
  stream.on('error', (e: NodeJS.ErrnoException) => {
    if (e.code === 'EPIPE') process.exit(0);
    throw e;
  });
}
quietOnClosedPipe(process.stdout);
quietOnClosedPipe(process.stderr);

/**
 * yargs lays out a command's whole help text right after starting its handler, kept in case the handler
 * fails and yargs prints that help with the failure; .fail() below throws instead and never prints it.
 * The layout of some eighty options costs about 0.1 s of CPU on every run: the caching is turned off
 * (through yargs' internal usage object; without it, nothing changes but the time).
 */
function skipHelpCaching(y: object): void {
  const internal = (y as { getInternalMethods?: () => { getUsageInstance?: () => { cacheHelpMessage?: () => void } } }).getInternalMethods?.();
  const usage = internal?.getUsageInstance?.();
  if (usage && typeof usage.cacheHelpMessage === 'function') usage.cacheHelpMessage = () => {};
}

export async function main(rawArgv: readonly string[]): Promise<number> {
  const argv = joinSignedValues(rawArgv);
  const debug = argv.includes('--debug');
  const jsonLines = argv.includes('--json-lines');
  const quiet = argv.includes('--quiet');
  let rep = new Reporter({ quiet, jsonLines });
  let exitCode = EXIT_OK;

  const y = yargs([...argv])
    .scriptName('refdelta')
    .usage('$0 <command> [options]\n\nDifferential GNSS positioning from RINEX files against a reference receiver at a known point: code (metres) and carrier phase with integer ambiguities (centimetres).')
    .option('quiet', { type: 'boolean', default: false, describe: 'print nothing but the failure sentence' })
    .option('json-lines', { type: 'boolean', default: false, describe: 'machine-readable progress, warnings and events: one JSON object per line on stdout' })
    .option('debug', { type: 'boolean', default: false, describe: 'print stack traces on failure' })
    .command(
      'solve',
      'position the rover epoch by epoch against the reference receiver(s)',
      (c) => {
        defineCarrierOptions(defineSolveOptions(c));
        for (const [cmd, what] of SOLVE_EXAMPLES) c.example(cmd, what);
        return c;
      },
      async (args) => {
        const a = args as unknown as Record<string, unknown>;
        const solveArgs: SolveArgs = solveArgsFrom(a);
        rep = new Reporter({ quiet: solveArgs.quiet ?? false, jsonLines: solveArgs.jsonLines ?? false });
        const { runSolve } = await import('./commands/solve.js');
        exitCode = (await runSolve(solveArgs, rep)).exitCode;
      },
    )
    .command(
      'inspect <files..>',
      'describe what observation or navigation files hold (JSON; --text for a readable view)',
      (c) =>
        c.positional('files', { type: 'string', array: true, describe: 'files to inspect (any RINEX encoding)' })
          .option('text', { type: 'boolean', default: false, describe: 'readable text instead of JSON' })
          .example(`refdelta inspect ${D}/rover-1s.obs`, 'JSON description of one file')
          .example(`refdelta inspect --text ${D}/KFRD-reference-5s.obs ${D}/broadcast-mixed.nav`, 'readable view of two files'),
      async (args) => {
        const files = ((args as unknown as { files?: string[] }).files ?? []).map(String);
        const { runInspect } = await import('./commands/inspect.js');
        exitCode = await runInspect(files, (args as unknown as { text?: boolean }).text === true, rep);
      },
    )
    .command(
      'points',
      'per-point coordinates: a solve run, then one averaged coordinate per occupation (windows, event flags or Doppler static detection)',
      (c) =>
        defineCarrierOptions(definePointsOptions(defineSolveOptions(c)))
          .example(`refdelta points ${DEMO_FILES} --ref-coord KFRD --marks ${D}/control-marks.csv --projection utm --geoid egm96 --out out/pts`, 'points with UTM grid coordinates and EGM96 heights'),
      async (args) => {
        const a = args as unknown as Record<string, unknown>;
        const pa: PointsArgs = pointsArgsFrom(a);
        rep = new Reporter({ quiet: pa.quiet ?? false, jsonLines: pa.jsonLines ?? false });
        const { runPoints } = await import('./commands/points.js');
        exitCode = await runPoints(pa, rep);
      },
    )
    .command(
      'batch',
      'a folder of rover sessions: a points run for each observation file (outputs in OUT/<session>/), batch-points.csv and batch-summary.json (exit code 4 when some sessions failed)',
      (c) =>
        defineCarrierOptions(definePointsOptions(defineProcessingOptions(
          c.option('sessions', { type: 'string', demandOption: true, describe: 'folder of rover observation files, one session each (any RINEX encoding; other files are skipped with a note)', group: 'Files:' })
            .option('reference', { type: 'string', array: true, describe: 'reference observation file(s) for every session', group: 'Files:' })
            .option('reference-dir', { type: 'string', describe: 'folder of reference observation files: each session uses those overlapping its time span', group: 'Files:' })
            .option('nav', { type: 'string', array: true, describe: 'navigation file(s) for every session', group: 'Files:' })
            .option('nav-dir', { type: 'string', describe: 'folder of navigation files: each session uses those with ephemerides for its time span', group: 'Files:' })
            .option('out', { type: 'string', demandOption: true, describe: 'output folder: OUT/<session>/ per session, batch-points.csv, batch-summary.json', group: 'Files:' })
            .option('jobs', { type: 'string', describe: 'sessions processed at once, on worker threads (default: the cores); outputs are the same for any value' }),
        )))
          .example(`refdelta batch --sessions field/ --reference ${D}/KFRD-reference-5s.obs --nav ${D}/broadcast-mixed.nav --ref-coord KFRD --marks ${D}/control-marks.csv --out out/batch`, 'every rover file of field/ against the KFRD reference'),
      async (args) => {
        const a = args as unknown as Record<string, unknown>;
        const p = pointsArgsFrom({ ...a, rover: '' });
        const ba: BatchArgs = {
          ...p, sessions: a.sessions, reference: (a.reference as string[] | undefined) ?? [], nav: (a.nav as string[] | undefined) ?? [],
          referenceDir: a.referenceDir, navDir: a.navDir, jobs: a.jobs,
        };
        rep = new Reporter({ quiet: ba.quiet ?? false, jsonLines: ba.jsonLines ?? false });
        const { runBatch } = await import('./commands/batch.js');
        exitCode = await runBatch(ba, rep);
      },
    )
    .command(
      'check',
      'compare points (points.csv) with published control marks: differences, pass/fail, NSSDA accuracy (exit code 3 when a mark fails)',
      (c) =>
        c.option('points', { type: 'string', demandOption: true, describe: 'points.csv written by refdelta points' })
          .option('marks', { type: 'string', demandOption: true, describe: 'control marks CSV (name, coordinates, frame, epoch[, accuracy_h_m, accuracy_v_m])' })
          .option('out', { type: 'string', demandOption: true, describe: 'output folder (control-check.csv, control-check.json)' })
          .option('radius', { type: 'number', default: DEFAULT_MATCH_RADIUS_M, describe: 'match by proximity within this horizontal distance (m) when names differ' })
          .option('tolerance-h', { type: 'number', default: DEFAULT_CHECK_TOLERANCE_H_M, describe: 'horizontal tolerance (m)' })
          .option('tolerance-v', { type: 'number', default: DEFAULT_CHECK_TOLERANCE_V_M, describe: 'vertical tolerance (m)' })
          .option('transform', { type: 'string', describe: "frame transformation(s) allowing a comparison across frames: a shipped set by name (ITRF2014>ETRF2000, ITRF2014>ITRF2008, ITRF2020>ITRF2014, WGS84=ITRF2014; either direction) or a Helmert parameter JSON file" })
          .option('allow-unknown-frame', { type: 'boolean', default: false, describe: 'accept frame names outside the known list' })
          .option('outputs', { type: 'string', describe: 'further outputs besides control-check.csv and control-check.json: gpkg (a control_check layer, one point per comparison at its mark)' })
          .example(`refdelta check --points out/pts/points.csv --marks ${D}/control-marks.csv --tolerance-h 0.5 --out out/check`, 'check against control marks'),
      async (args) => {
        const a = args as unknown as Record<string, unknown>;
        const ca: CheckArgs = { points: a.points, marks: a.marks, out: a.out, radius: a.radius, toleranceH: a.toleranceH, toleranceV: a.toleranceV, transform: a.transform, allowUnknownFrame: a.allowUnknownFrame, outputs: a.outputs };
        const { runCheck } = await import('./commands/check.js');
        exitCode = await runCheck(ca, rep);
      },
    )
    .command(
      'report <dir>',
      'a self-contained HTML page (report.html: charts, tables, inputs, cautions) from a solve, points, check or batch output folder',
      (c) =>
        c.positional('dir', { type: 'string', describe: 'output folder of solve, points, check or batch' })
          .example('refdelta report out/pts', 'out/pts/report.html from the outputs in out/pts')
          .example('refdelta report out/batch', "each session's report and out/batch/report.html linking them"),
      async (args) => {
        const { runReport } = await import('./commands/report.js');
        exitCode = await runReport(String((args as unknown as { dir?: string }).dir ?? ''), rep);
      },
    )
    .example(`refdelta solve ${DEMO_FILES} --ref-coord KFRD --marks ${D}/control-marks.csv --out out/run`, 'per-epoch positions against the reference on mark KFRD')
    .example(`refdelta points ${DEMO_FILES} --ref-coord KFRD --marks ${D}/control-marks.csv --projection utm --out out/pts`, 'one coordinate per logged point, in UTM')
    .example(`refdelta check --points out/pts/points.csv --marks ${D}/control-marks.csv --out out/check`, 'compare the points with published control marks')
    .example(`refdelta batch --sessions field/ --reference ${D}/KFRD-reference-5s.obs --nav ${D}/broadcast-mixed.nav --ref-coord header --out out/batch`, 'every session of a folder')
    .example(`refdelta inspect --text ${D}/rover-1s.obs`, 'what a RINEX file holds')
    .demandCommand(1, 'give a command: solve, points, batch, check, report or inspect')
    .strict()
    .middleware((argv) => {
      // An option that takes one value given twice: yargs would hand on both as a list.
      const o = (y as unknown as { getOptions(): { array: string[]; key: Record<string, unknown> } }).getOptions();
      const lists = new Set(o.array);
      for (const name of Object.keys(o.key)) {
        const v = argv[name];
        if (Array.isArray(v) && !lists.has(name) && name.length > 1 && !/[A-Z]/.test(name)) {
          throw new UsageError(`--${name} was given ${v.length} times (${v.map((x) => `'${String(x)}'`).join(', ')}): give it once`);
        }
      }
    }, true)
    .version(SOFTWARE.version)
    .help()
    .alias('h', 'help')
    .epilog('Exit codes: 0 ok, 1 reading or processing failed, 2 wrong command line, 3 a control mark failed (check), 4 some sessions failed (batch). See README.md.')
    .wrap(Math.min(110, process.stdout.columns || 100))
    .fail((msg, err) => {
      if (err) throw err;
      const known = Object.keys((y as unknown as { getOptions(): { key: Record<string, unknown> } }).getOptions().key);
      throw new UsageError(unknownOptionSentence(msg, known, argv) ?? msg ?? 'wrong command line');
    });

  skipHelpCaching(y);
  try {
    await y.parseAsync();
    return exitCode;
  } catch (e) {
    const f = describeFailure(e);
    rep.failure(
      f.exitCode === EXIT_USAGE ? `${f.sentence} (see refdelta --help)` : f.sentence,
      f.exitCode,
      debug && e instanceof Error ? e.stack : undefined,
    );
    return f.exitCode;
  }
}

/** Runs the command line and sets the process exit code (what the `refdelta` bin does). */
export function runFromProcess(): Promise<void> {
  return main(hideBin(process.argv)).then(
    (code) => { process.exitCode = code; },
    (e: unknown) => {
      process.stderr.write(`refdelta: internal error: ${visibleLine(e instanceof Error ? e.message : String(e))}\n`);
      process.exitCode = 1;
    },
  );
}

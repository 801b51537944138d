/**
 * `refdelta check`: computed points (points.csv) against published control marks (control CSV):
 * matching, differences, pass/fail per mark, NSSDA statistics; control-check.csv and control-check.json
 * into --out. Exit code 3 (EXIT_CHECK_FAILED) when a mark fails its tolerance.
 */
import { readFile } from 'node:fs/promises';
import { join, resolve } from 'node:path';
import { csvText } from '../csv-text.js';
import {
  CONTROL_CHECK_COLUMNS, checkAgainstControl, controlCheckJson, controlCheckPreamble, controlCheckRows, fixed,
  parseControlCsv, parseHelmertJson, parsePointsCsv, type HelmertParams,
} from '@refdelta/core';
import { OutputSet, requireFile } from '../node-io.js';
import { prepareOutputFolder } from '../output-folder.js';
import { parseNumber } from '../parse-values.js';
import { Reporter } from '../reporter.js';
import { EXIT_CHECK_FAILED, EXIT_OK, EXIT_PROCESSING } from '../exit-codes.js';
import { UsageError } from '../usage-error.js';

export interface CheckArgs {
  readonly points: unknown;
  readonly marks: unknown;
  readonly out: unknown;
  readonly radius?: unknown;
  readonly toleranceH?: unknown;
  readonly toleranceV?: unknown;
  readonly transform?: unknown;
}

export const CHECK_FILE_NAMES = { csv: 'control-check.csv', json: 'control-check.json' } as const;

async function text(path: string): Promise<string> {
  await requireFile(path);
  return readFile(path, 'utf8');
}

export async function runCheck(a: CheckArgs, rep: Reporter): Promise<number> {
  if (a.points === undefined || a.marks === undefined || a.out === undefined) throw new UsageError('give --points FILE, --marks FILE and --out DIR');
  const radiusM = a.radius === undefined ? undefined : parseNumber('radius', a.radius, 0, 10000);
  const tolH = a.toleranceH === undefined ? undefined : parseNumber('tolerance-h', a.toleranceH, 0, 1000);
  const tolV = a.toleranceV === undefined ? undefined : parseNumber('tolerance-v', a.toleranceV, 0, 1000);
  const pointsFile = String(a.points), marksFile = String(a.marks);
  await prepareOutputFolder({
    dir: String(a.out), inputs: [pointsFile, marksFile, ...(a.transform !== undefined ? [String(a.transform)] : [])],
    outputNames: Object.values(CHECK_FILE_NAMES), estimatedBytes: 0,
  });
  const points = parsePointsCsv(pointsFile, await text(pointsFile));
  const marks = parseControlCsv(marksFile, await text(marksFile), rep.warn);
  let transformations: HelmertParams[] | undefined;
  if (a.transform !== undefined) transformations = parseHelmertJson(String(a.transform), await text(String(a.transform)));
  rep.event('start', { command: 'check', points: pointsFile, marks: marksFile });

  const r = checkAgainstControl(points, marks, {
    ...(radiusM !== undefined ? { radiusM } : {}), ...(tolH !== undefined ? { toleranceHorizontalM: tolH } : {}),
    ...(tolV !== undefined ? { toleranceVerticalM: tolV } : {}), ...(transformations ? { transformations } : {}),
    onWarning: rep.warn,
  });

  const outDir = resolve(String(a.out));
  const csvPath = join(outDir, CHECK_FILE_NAMES.csv), jsonPath = join(outDir, CHECK_FILE_NAMES.json);
  // A transformation between frames is never silent: the sets given are named in both outputs.
  const transformLines = (transformations ?? []).map((h) => `${h.from} -> ${h.to} at epoch ${h.epochYear} (source: ${h.source})`);
  const preamble = [...controlCheckPreamble(r), ...transformLines.map((t) => `# transformation available (--transform ${String(a.transform)}): ${t}`)];
  const csv = preamble.join('\n') + '\n' + csvText([[...CONTROL_CHECK_COLUMNS], ...controlCheckRows(r)]);
  const doc = { ...controlCheckJson(r, { pointsFile: resolve(pointsFile), marksFile: resolve(marksFile), createdUtc: new Date().toISOString(), warnings: rep.warnings }),
    transformations: transformLines };
  // The pair is one set: both sealed (flushed, fsynced) before either is renamed, the JSON last.
  const set = new OutputSet();
  await set.add('control-check', csvPath, [csv]);
  await set.add('control-check-json', jsonPath, [JSON.stringify(doc, null, 2) + '\n']);
  for (const { kind, written } of await set.commit()) rep.event('output', { kind, path: written.path, bytes: written.bytes, sha256: written.sha256 });

  for (const p of r.pairs) {
    rep.info(`${p.pointName} vs ${p.markName} (${p.by}): dE ${fixed(p.comparison.dE, 3)} dN ${fixed(p.comparison.dN, 3)} dU ${fixed(p.comparison.dU, 3)} m, ` +
      `horizontal ${fixed(p.comparison.horizontalM, 3)} m: ${p.comparison.pass ? 'pass' : 'FAIL'}`);
  }
  if (r.nssda) rep.info(`NSSDA over ${r.nssda.n} check point(s): horizontal ${fixed(r.nssda.horizontal95M, 3)} m, vertical ${fixed(r.nssda.vertical95M, 3)} m at 95 %`);
  rep.info(`outputs in ${outDir}: ${CHECK_FILE_NAMES.csv}, ${CHECK_FILE_NAMES.json}`);
  if (r.pairs.length === 0) {
    rep.failure(`no point of ${pointsFile} matched a mark of ${marksFile} by name or within ${r.radiusM} m`, EXIT_PROCESSING);
    rep.event('done', { exit_code: EXIT_PROCESSING });
    return EXIT_PROCESSING;
  }
  if (!r.allPass) {
    const failed = r.pairs.filter((p) => !p.comparison.pass).map((p) => p.markName);
    rep.failure(`${failed.length} of ${r.pairs.length} control mark(s) failed the tolerance (horizontal ${r.toleranceHorizontalM} m, vertical ${r.toleranceVerticalM} m): ${failed.join(', ')}`, EXIT_CHECK_FAILED);
    rep.event('done', { exit_code: EXIT_CHECK_FAILED });
    return EXIT_CHECK_FAILED;
  }
  rep.event('done', { exit_code: EXIT_OK, pairs: r.pairs.length });
  return EXIT_OK;
}

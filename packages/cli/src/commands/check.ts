/**
 * `refdelta check`: computed points (points.csv) against published control marks (control CSV):
 * matching, differences, pass/fail per mark, NSSDA statistics; control-check.csv and control-check.json
 * into --out. Exit code 3 (EXIT_CHECK_FAILED) when a mark fails its tolerance.
 */
import { readFile } from 'node:fs/promises';
import { basename, join, resolve } from 'node:path';
import { csvText } from '../csv-text.js';
import {
  CHECK_OUTPUT_FORMATS, CONTROL_CHECK_COLUMNS, closerReading, differenceTestWord, FAR_NAME_MATCH_M, farNameMatches, farNameMatchSentence, checkAgainstControl, csvtText, controlCheckJson, controlCheckNotes, controlCheckRows, fixed, metadataFileName, tableMetadata,
  looksLikeTransformationName, parseMarksFile, parseHelmertJson, parsePointsCsv, shippedTransformation, type DifferenceTest, type HelmertParams,
} from '@refdelta/core';
import { OutputSet, requireFile } from '../node-io.js';
import { prepareOutputFolder } from '../output-folder.js';
import { parseChoiceList, parseNumber } from '../parse-values.js';
import { epsgLookup, epsgWkt } from '../epsg-lookup.js';
import { sqliteFactory } from './solve.js';
import { Reporter } from '../reporter.js';
import { EXIT_CHECK_FAILED, EXIT_OK, EXIT_PROCESSING } from '../exit-codes.js';
import { UsageError } from '../usage-error.js';
import { requireKnownFrame } from '../frame-check.js';

export interface CheckArgs {
  readonly points: unknown;
  readonly marks: unknown;
  readonly out: unknown;
  readonly radius?: unknown;
  readonly toleranceH?: unknown;
  readonly toleranceV?: unknown;
  readonly transform?: unknown;
  readonly allowUnknownFrame?: unknown;
  /** Further outputs (CHECK_OUTPUT_FORMATS kinds, e.g. gpkg). */
  readonly outputs?: unknown;
}

export const CHECK_FILE_NAMES = { csv: 'control-check.csv', json: 'control-check.json' } as const;

/**
 * --transform: shipped sets by name ('ITRF2014>ETRF2000', several separated by commas) or a parameter
 * JSON file (frames/helmert-json.ts).
 */
async function transformationsFrom(v: unknown): Promise<HelmertParams[]> {
  const given = (Array.isArray(v) ? v : [v]).map(String);
  const out: HelmertParams[] = [];
  for (const g of given) {
    for (const part of g.split(',').map((x) => x.trim()).filter(Boolean)) {
      if (looksLikeTransformationName(part)) {
        try { out.push(shippedTransformation(part)); } catch (e) { throw new UsageError(`--transform ${part}: ${e instanceof Error ? e.message : String(e)}`); }
      } else {
        out.push(...parseHelmertJson(part, await text(part)));
      }
    }
  }
  return out;
}

async function text(path: string): Promise<string> {
  await requireFile(path);
  return readFile(path, 'utf8');
}

/** '; difference test accepted (chi2_h 0.52, chi2_v 0.10)' for the per-pair line, '' when not tested. */
function testWords(t: DifferenceTest): string {
  const word = differenceTestWord(t);
  if (word === '') return '';
  const stats = [...(Number.isNaN(t.chi2Horizontal) ? [] : [`chi2_h ${fixed(t.chi2Horizontal, 2)}`]), ...(Number.isNaN(t.chi2Vertical) ? [] : [`chi2_v ${fixed(t.chi2Vertical, 2)}`])];
  return `; difference test ${word} (${stats.join(', ')})`;
}

export async function runCheck(a: CheckArgs, rep: Reporter): Promise<number> {
  if (a.points === undefined || a.marks === undefined || a.out === undefined) throw new UsageError('give --points FILE, --marks FILE and --out DIR');
  const radiusM = a.radius === undefined ? undefined : parseNumber('radius', a.radius, 0, 10000);
  const tolH = a.toleranceH === undefined ? undefined : parseNumber('tolerance-h', a.toleranceH, 0, 1000);
  const tolV = a.toleranceV === undefined ? undefined : parseNumber('tolerance-v', a.toleranceV, 0, 1000);
  const extraKinds = a.outputs === undefined || a.outputs === '' ? [] : parseChoiceList('outputs', a.outputs, CHECK_OUTPUT_FORMATS.map((f) => f.kind));
  const pointsFile = String(a.points), marksFile = String(a.marks);
  await prepareOutputFolder({
    dir: String(a.out), inputs: [pointsFile, marksFile, ...(a.transform !== undefined ? [String(a.transform)] : [])],
    outputNames: Object.values(CHECK_FILE_NAMES), estimatedBytes: 0,
  });
  const points = parsePointsCsv(pointsFile, await text(pointsFile));
  const marks = parseMarksFile(marksFile, await text(marksFile), rep.warn, epsgLookup);
  const allowUnknown = a.allowUnknownFrame === true;
  for (const p of points) requireKnownFrame(p.position.frame.name, `${pointsFile} line ${p.line}`, allowUnknown);
  for (const m of marks) requireKnownFrame(m.position.frame.name, `${marksFile} line ${m.line}`, allowUnknown);
  let transformations: HelmertParams[] | undefined;
  if (a.transform !== undefined) transformations = await transformationsFrom(a.transform);
  rep.event('start', { command: 'check', points: pointsFile, marks: marksFile });

  const r = checkAgainstControl(points, marks, {
    ...(radiusM !== undefined ? { radiusM } : {}), ...(tolH !== undefined ? { toleranceHorizontalM: tolH } : {}),
    ...(tolV !== undefined ? { toleranceVerticalM: tolV } : {}), ...(transformations ? { transformations } : {}),
    onWarning: rep.warn,
  });
  // A match by name kilometres away is a CRS mistake in the marks file, not a survey result: said once, before the outputs record the warnings.
  const markNamed = new Map(marks.map((m) => [m.name, m]));
  const named = r.pairs.map((p) => {
    const mark = markNamed.get(p.markName);
    const closer = p.by === 'name' && p.comparison.horizontalM > FAR_NAME_MATCH_M && mark ? closerReading(mark, p.pointPosition.ecef, epsgLookup) : null;
    return { session: p.session, pointName: p.pointName, markName: p.markName, ...(mark ? { markLine: mark.line } : {}), by: p.by, horizontalM: p.comparison.horizontalM, closer };
  });
  const far = farNameMatchSentence(named, marksFile);
  if (far) rep.warn({ file: marksFile, line: farNameMatches(named)[0]?.markLine ?? 0, code: 'marks-far-from-points', message: far });

  const outDir = resolve(String(a.out));
  const csvPath = join(outDir, CHECK_FILE_NAMES.csv), jsonPath = join(outDir, CHECK_FILE_NAMES.json);
  // A transformation between frames is never silent: the sets given are named in both outputs.
  const transformLines = (transformations ?? []).map((h) => `${h.from} -> ${h.to} at epoch ${h.epochYear} (source: ${h.source})`);
  const csv = csvText([[...CONTROL_CHECK_COLUMNS], ...controlCheckRows(r)]);
  const meta = tableMetadata({
    file: CHECK_FILE_NAMES.csv, title: 'refdelta control check: computed point minus published mark, one row per point matched to a mark', columns: CONTROL_CHECK_COLUMNS, frame: null,
    notes: [...controlCheckNotes(r), ...transformLines.map((t) => `transformation available (--transform ${String(a.transform)}): ${t}`)],
  });
  const doc = { ...controlCheckJson(r, { pointsFile: resolve(pointsFile), marksFile: resolve(marksFile), createdUtc: new Date().toISOString(), warnings: rep.warnings }),
    transformations: transformLines };
  // The pair is one set: both sealed (flushed, fsynced) before either is renamed, the JSON last.
  const set = new OutputSet();
  await set.add('control-check', csvPath, [csv]);
  await set.add('control-check-csvt', join(outDir, 'control-check.csvt'), [csvtText(CONTROL_CHECK_COLUMNS)]);
  for (const f of CHECK_OUTPUT_FORMATS) {
    if (!extraKinds.includes(f.kind)) continue;
    const built = f.build({
      columns: CONTROL_CHECK_COLUMNS, rows: controlCheckRows(r), frames: r.pairs.map((p) => p.markPosition.frame), wkt: (c) => epsgWkt(c),
      ...(f.kind === 'gpkg' ? { openDatabase: await sqliteFactory() } : {}),
    });
    await set.add(`control-check-${f.kind}`, join(outDir, f.fileName), [built]);
  }
  await set.add('control-check-metadata', join(outDir, metadataFileName(CHECK_FILE_NAMES.csv)), [JSON.stringify(meta, null, 2) + '\n']);
  await set.add('control-check-json', jsonPath, [JSON.stringify(doc, null, 2) + '\n']);
  const written = await set.commit();
  for (const { kind, written: w } of written) rep.event('output', { kind, path: w.path, bytes: w.bytes, sha256: w.sha256 });

  for (const p of r.pairs) {
    rep.info(`${p.session ? `${p.session}/` : ''}${p.pointName} vs ${p.markName} (${p.by}): dE ${fixed(p.comparison.dE, 3)} dN ${fixed(p.comparison.dN, 3)} dU ${fixed(p.comparison.dU, 3)} m, ` +
      `horizontal ${fixed(p.comparison.horizontalM, 3)} m: ${p.comparison.pass ? 'pass' : 'FAIL'}${testWords(p.test)}`);
  }
  if (r.tested > 0) {
    const rejected = r.pairs.filter((p) => p.test.rejectedHorizontal || p.test.rejectedVertical).map((p) => `${p.session ? `${p.session}/` : ''}${p.pointName}`);
    rep.info(`difference test at 95 %: ${r.rejected} of ${r.tested} difference(s) larger than the point's precision and the mark's accuracy explain${rejected.length ? ` (${rejected.join(', ')})` : ''}; pass/fail is the tolerance's`);
  }
  if (r.nssda) rep.info(`NSSDA over ${r.nssda.n} check point(s): horizontal ${fixed(r.nssda.horizontal95M, 3)} m, vertical ${fixed(r.nssda.vertical95M, 3)} m at 95 %`);
  rep.info(`outputs in ${outDir}: ${written.map((w) => basename(w.written.path)).join(', ')}`);
  if (r.pairs.length === 0) {
    rep.failure(`no point of ${pointsFile} matched a mark of ${marksFile} by name or within ${r.radiusM} m`, EXIT_PROCESSING);
    rep.event('done', { exit_code: EXIT_PROCESSING });
    return EXIT_PROCESSING;
  }
  if (!r.allPass) {
    const failed = r.pairs.filter((p) => !p.comparison.pass).map((p) => `${p.session ? `${p.session}/` : ''}${p.pointName} on ${p.markName}`);
    rep.failure(`${failed.length} of ${r.pairs.length} comparison(s) with control marks failed the tolerance (horizontal ${r.toleranceHorizontalM} m, vertical ${r.toleranceVerticalM} m): ${failed.join(', ')}`, EXIT_CHECK_FAILED);
    rep.event('done', { exit_code: EXIT_CHECK_FAILED });
    return EXIT_CHECK_FAILED;
  }
  rep.event('done', { exit_code: EXIT_OK, pairs: r.pairs.length });
  return EXIT_OK;
}

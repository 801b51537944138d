/** `refdelta inspect FILE...`: what each file holds, as JSON (default) or readable text. */
import {
  FormatError, inspectNav, inspectObs, navInspectionText, obsInspectionText, readNav, readObsStream,
  type NavInspection, type ObsInspection, type Warning,
} from '@refdelta/core';
import { openTextFile } from '../node-io.js';
import { Reporter } from '../reporter.js';
import { visible } from '../visible-text.js';

/** The first line of a text stream, and the stream again from its start. */
export async function peekFirstLine(text: AsyncIterable<string>): Promise<{ firstLine: string; text: AsyncIterable<string> }> {
  const it = text[Symbol.asyncIterator]();
  const seen: string[] = [];
  let joined = '';
  let done = false;
  while (!/[\r\n]/.test(joined) && joined.length < 4096) {
    const r = await it.next();
    if (r.done) { done = true; break; }
    seen.push(r.value);
    joined += r.value;
  }
  const firstLine = joined.split(/\r\n|\n|\r/)[0] ?? '';
  async function* again(): AsyncIterable<string> {
    yield* seen;
    if (done) return;
    for (;;) {
      const r = await it.next();
      if (r.done) return;
      yield r.value;
    }
  }
  return { firstLine, text: again() };
}

/** RINEX VERSION / TYPE, column 21: the file type letter (RINEX 2.11 table A1/A3, RINEX 3.05 table A1). */
export function rinexFileType(firstLine: string): string | null {
  if (firstLine.slice(60, 80).trim() !== 'RINEX VERSION / TYPE') return null;
  return firstLine.charAt(20).toUpperCase();
}

export async function inspectFile(path: string, rep: Reporter): Promise<ObsInspection | NavInspection> {
  const warnings: Warning[] = [];
  const sink = (w: Warning): void => { warnings.push(w); rep.event('warning', { file: w.file ?? path, line: w.line ?? null, code: w.code, message: w.message }); };
  const opened = await openTextFile(path, sink);
  const { firstLine, text } = await peekFirstLine(opened.text);
  const type = rinexFileType(firstLine);
  if (type === null) {
    throw new FormatError(path, 1, `${path} is not a RINEX file: its first line does not end with the label 'RINEX VERSION / TYPE' in columns 61-80`);
  }
  if (type === 'O') {
    const stream = await readObsStream(path, text, { onWarning: sink });
    return inspectObs(stream, { layers: opened.layers, warnings });
  }
  const nav = await readNav(path, text, { onWarning: sink });
  return inspectNav(nav, { layers: opened.layers, warnings });
}

export async function runInspect(files: readonly string[], asText: boolean, rep: Reporter): Promise<number> {
  const results: (ObsInspection | NavInspection)[] = [];
  for (const f of files) {
    const r = await inspectFile(f, rep);
    results.push(r);
    if (asText) process.stdout.write(visible((r.kind === 'observation' ? obsInspectionText(r) : navInspectionText(r)) + '\n'));
  }
  if (!asText) {
    const body = JSON.stringify(results.length === 1 ? results[0] : results, null, 2) + '\n';
    if (rep.jsonLinesMode) rep.event('inspection', { results });
    else process.stdout.write(body);
  }
  return 0;
}

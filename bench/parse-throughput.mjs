// Part 1: observation-reader throughput on real day files held in memory as plain RINEX text,
// against a bare line scan of the same text; the reader from the bytes against Buffer latin1 + split of
// the same bytes (CPU), beside one JavaScript pass over those bytes; the compact-RINEX decode throughput
// and the reader from the .crx bytes. The reader from bytes is timed reading every system's values, and
// reading only those of the systems a solve asks for (readObsStream's `systems`, as `refdelta solve`
// passes its --systems: the default list and GPS alone), the other satellites handed out with blank fields.
import { readFileSync, existsSync } from 'node:fs';
import { gunzipSync } from 'node:zlib';
import { resolve } from 'node:path';
import { memoryChunks } from './scenario.mjs';
import { repeat } from './stats.mjs';

/** Bare scan A: String.prototype.split into lines, count them. */
function splitScan(text) {
  return text.split('\n').length;
}

/** Lines handed out by scan B land here, so the engine cannot skip making them. */
let lastLine = '';

/**
 * Bare scan B: indexOf loop handing out each line as a string (what a line reader must at least do).
 * Each line is stored where the caller can see it and its first character is read: with only
 * slice(...).length, V8 folds the slice away and the loop measures indexOf alone.
 */
function indexOfScan(text) {
  let pos = 0, n = 0, first = 0;
  for (;;) {
    const nl = text.indexOf('\n', pos);
    if (nl < 0) break;
    lastLine = text.slice(pos, nl);
    first += lastLine.charCodeAt(0) | 0;
    n++;
    pos = nl + 1;
  }
  return n + (first & 1);
}

async function parseAll(core, text) {
  const st = await core.readObsStream('bench', memoryChunks(text));
  let sats = 0, values = 0;
  for await (const e of st.epochs) {
    sats += e.sats.length;
    for (const s of e.sats) values += s.values.length;
  }
  return { sats, values };
}

/** Node's latin1 decoding, as the command line hands it to openText. */
const latin1 = (b) => Buffer.from(b.buffer, b.byteOffset, b.byteLength).toString('latin1');

/** The floor from bytes: Buffer latin1 decoding of the plain RINEX bytes, split into lines, counted. */
function bytesScan(bytes) {
  return latin1(bytes).split('\n').length;
}

/**
 * One JavaScript pass over the same bytes: every byte read once from a Uint8Array and summed. Not a
 * floor (it parses nothing): what any JavaScript reader that looks at every character pays at least,
 * to set the reader's ratio beside.
 */
let byteSum = 0;
function jsBytePass(bytes) {
  let sum = 0;
  for (let i = 0; i < bytes.length; i++) sum = (sum + bytes[i]) | 0;
  byteSum = sum;
  return sum;
}

/** Systems whose values a solve asks the reader for: the command's default --systems, and GPS alone. */
export const SOLVE_SYSTEMS = { default: ['G', 'R', 'E', 'C', 'J'], gps: ['G'] };

/**
 * The reader as the command line uses it: bytes (64 KiB chunks) -> openText (Buffer latin1, decompression)
 * -> readObsStream, reading the values of `systems` only when given (all when undefined). Given openText's
 * text of a plain file, readObsStream takes its bytes instead and parses them (core compress/byte-text.ts,
 * rinex/byte-lines.ts): only the header lines (and rare ones: event records, lines skipped to resynchronise)
 * are decoded to text, so the reader does not pay the latin1 decoding that the floor pays. Given a
 * compact RINEX file, it reads openText's text.
 */
async function parseBytes(core, bytes, name = 'bench.obs', systems = undefined) {
  const opened = await core.openText(name, (async function* () {
    for (let i = 0; i < bytes.length; i += 1 << 16) yield bytes.subarray(i, Math.min(bytes.length, i + (1 << 16)));
  })(), { decodeLatin1: latin1 });
  const st = await core.readObsStream(name, opened.text, systems ? { systems } : undefined);
  let sats = 0;
  for await (const e of st.epochs) sats += e.sats.length;
  return sats;
}

async function parseCase(core, name, text, decode) {
  const mb = text.length / 1e6; // RINEX is ASCII: one character = one byte
  const counts = await parseAll(core, text);
  const parse = await repeat(() => parseAll(core, text), { minRuns: 5, minTotalMs: 3000 });
  const split = await repeat(() => splitScan(text), { minRuns: 10, minTotalMs: 1000 });
  const scan = await repeat(() => indexOfScan(text), { minRuns: 10, minTotalMs: 1000 });
  const splitMBs = mb / split.medianMs * 1000, scanMBs = mb / scan.medianMs * 1000;
  const bare = splitMBs >= scanMBs ? { how: "text.split('\\n').length", mbs: splitMBs } : { how: 'indexOf loop + slice per line', mbs: scanMBs };
  const parserMBs = mb / parse.medianMs * 1000;
  // The same comparison starting from the file's bytes (what a bare scan of 'the same bytes' does):
  // both sides then pay the byte -> string decoding.
  const bytes = new Uint8Array(Buffer.from(text, 'latin1'));
  const pb = await repeat(() => parseBytes(core, bytes), { minRuns: 5, minTotalMs: 3000 });
  const sb = await repeat(() => bytesScan(bytes), { minRuns: 10, minTotalMs: 1000 });
  const js = await repeat(() => jsBytePass(bytes), { minRuns: 10, minTotalMs: 1000 });
  // the same reading with only the values of the systems a solve asks for
  const pDefault = await repeat(() => parseBytes(core, bytes, 'bench.obs', SOLVE_SYSTEMS.default), { minRuns: 5, minTotalMs: 3000 });
  const pGps = await repeat(() => parseBytes(core, bytes, 'bench.obs', SOLVE_SYSTEMS.gps), { minRuns: 5, minTotalMs: 3000 });
  const fromBytes = {
    parserMBs: mb / pb.medianMs * 1000, bareMBs: mb / sb.medianMs * 1000, parserCpuMs: pb.medianCpuMs, bareCpuMs: sb.medianCpuMs, jsPassCpuMs: js.medianCpuMs,
    defaultSystemsCpuMs: pDefault.medianCpuMs, gpsCpuMs: pGps.medianCpuMs,
  };
  return {
    fromBytes: { ...fromBytes, ratio: fromBytes.parserMBs / fromBytes.bareMBs, cpuRatio: sb.medianCpuMs / pb.medianCpuMs },
    name, mb, lines: splitScan(text), sats: counts.sats, values: counts.values,
    parserMBs, parserBestMBs: mb / Math.min(...parse.times) * 1000, parseRuns: parse.times.length, splitMBs, scanMBs, bare, ratio: parserMBs / bare.mbs,
    ...(decode ? { decode } : {}),
  };
}

/** The reader from the compact file's own bytes (decoding included), against the floor on those bytes. */
async function parseCrxBytes(core, file, crx) {
  const pb = await repeat(() => parseBytes(core, crx, file), { minRuns: 5, minTotalMs: 3000 });
  const sb = await repeat(() => bytesScan(crx), { minRuns: 10, minTotalMs: 1000 });
  return { readerCpuMs: pb.medianCpuMs, floorCpuMs: sb.medianCpuMs, cpuRatio: sb.medianCpuMs / pb.medianCpuMs };
}

async function decodeCrx(core, file, bytes) {
  let text = '';
  const run = async () => {
    const parts = [];
    const opened = await core.openText(file, (async function* () { yield bytes; })());
    for await (const c of opened.text) parts.push(c);
    text = parts.join('');
  };
  const r = await repeat(run, { minRuns: 3, minTotalMs: 0, maxRuns: 3 });
  return { text, decodeMBs: text.length / 1e6 / r.medianMs * 1000, decodeRuns: r.times.length };
}

/** Returns one result per day file found (a file that is absent is reported as skipped). */
export async function benchParse(core, dataDir) {
  const out = [];
  const dgar = resolve(dataDir, 'single-station/dgar0100.24o.gz');
  if (existsSync(dgar)) {
    const text = new TextDecoder('latin1').decode(gunzipSync(readFileSync(dgar)));
    out.push(await parseCase(core, 'DGAR dgar0100.24o (RINEX 2.11)', text, null));
  } else out.push({ name: 'DGAR', skipped: `${dgar} not found` });
  const bele = resolve(dataDir, 'single-station/BELE00BRA_R_20240100000_01D_30S_MO.crx.gz');
  if (existsSync(bele)) {
    const crx = new Uint8Array(gunzipSync(readFileSync(bele)));
    const d = await decodeCrx(core, 'BELE00BRA_R_20240100000_01D_30S_MO.crx', crx);
    const fromCrx = await parseCrxBytes(core, 'BELE00BRA_R_20240100000_01D_30S_MO.crx', crx);
    out.push(await parseCase(core, 'BELE ...01D_30S_MO.crx (RINEX 3.05, after CRX decode)', d.text, { crxMB: crx.length / 1e6, decodeMBs: d.decodeMBs, runs: d.decodeRuns, fromCrx }));
  } else out.push({ name: 'BELE', skipped: `${bele} not found` });
  return out;
}

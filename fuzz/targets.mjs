/**
 * The readers under fuzz and the inputs they get: real seed files (the project's hand-made fixtures
 * and fuzz/seeds) damaged at random by a seeded generator, so every input can be made again from
 * (seed, target, index). Used by fuzz/run.mjs (workers, at scale) and test/fuzz-sample.test.ts (a small
 * seeded sample in npm test).
 */
import { readFileSync } from 'node:fs';
import { gzipSync } from 'node:zlib';
import { dirname, join } from 'node:path';
import { fileURLToPath } from 'node:url';
import * as core from '../packages/core/dist/index.js';
import { lzwEncode } from './lzw.mjs';

const ROOT = join(dirname(fileURLToPath(import.meta.url)), '..');
const bytesOf = (p) => new Uint8Array(readFileSync(join(ROOT, p)));

export { prng } from './prng.mjs';
import { prng } from './prng.mjs';

const pick = (r, xs) => xs[Math.floor(r() * xs.length)];
const ATOMS = ['', ' ', '0', '-1', '999999', '1e308', 'NaN', '-', '=', '"', ',', '\r', '\n', '\t', '\x00', '\x1b[2J', '\xef\xbb\xbf',
  'END OF HEADER', 'COMMENT', '> ', 'G01', '9'.repeat(40), 'D+99', '.', '99999999999999999999'];

/** Text-level damage: lines deleted, duplicated, swapped, cut; fields changed; bytes flipped. */
export function damageText(r, text) {
  let lines = text.split('\n');
  const n = 1 + Math.floor(r() * 6);
  for (let k = 0; k < n; k++) {
    const i = Math.floor(r() * lines.length);
    const op = Math.floor(r() * 10);
    if (op === 0) lines.splice(i, 1);
    else if (op === 1) lines.splice(i, 0, lines[Math.floor(r() * lines.length)] ?? '');
    else if (op === 2) { const j = Math.floor(r() * lines.length); [lines[i], lines[j]] = [lines[j], lines[i]]; }
    else if (op === 3) lines[i] = (lines[i] ?? '').slice(0, Math.floor(r() * 90));
    else if (op === 4) { const l = lines[i] ?? ''; const c = Math.floor(r() * (l.length + 1)); lines[i] = l.slice(0, c) + pick(r, ATOMS) + l.slice(c + Math.floor(r() * 4)); }
    else if (op === 5) lines = lines.slice(0, i + 1);
    else if (op === 6) { const l = lines[i] ?? ''; const c = Math.floor(r() * (l.length + 1)); lines[i] = l.slice(0, c) + String.fromCharCode(Math.floor(r() * 256)) + l.slice(c + 1); }
    else if (op === 7) lines.splice(i, 0, ...Array.from({ length: Math.floor(r() * 50) }, () => lines[i] ?? ''));
    else if (op === 8) lines[i] = (lines[i] ?? '').replace(/\d/g, () => String(Math.floor(r() * 10)));
    else lines[i] = (lines[i] ?? '').replace(/[ .]/, pick(r, ATOMS));
  }
  const sep = r() < 0.1 ? pick(r, ['\r\n', '\r']) : '\n';
  let out = lines.join(sep);
  if (r() < 0.03) out = '\ufeff' + out;
  return out;
}

/** Byte-level damage of a binary stream: flips, cuts, inserted runs. */
export function damageBytes(r, b) {
  const out = Array.from(b);
  const n = 1 + Math.floor(r() * 4);
  for (let k = 0; k < n; k++) {
    const i = Math.floor(r() * out.length);
    const op = Math.floor(r() * 4);
    if (op === 0) out[i] = Math.floor(r() * 256);
    else if (op === 1) out.length = Math.max(0, i);
    else if (op === 2) out.splice(i, 0, ...Array.from({ length: 1 + Math.floor(r() * 16) }, () => Math.floor(r() * 256)));
    else out[i] ^= 1 << Math.floor(r() * 8);
  }
  return new Uint8Array(out);
}

const latin1 = (b) => Buffer.from(b).toString('latin1');
const toBytes = (s) => new Uint8Array(Buffer.from(s, 'latin1'));
async function* chunked(b, r) {
  const size = 1 + Math.floor(r() * 4096);
  for (let i = 0; i < b.length; i += size) yield b.subarray(i, i + size);
}

const SEEDS = {
  obs: ['fixtures/rinex/r2-events.24o', 'fixtures/rinex/r3-scale-events.rnx', 'fixtures/rinex/r301-beidou.rnx', 'fixtures/rinex/r4-obs.rnx', 'fixtures/compress/hand0100.24o'].map((p) => latin1(bytesOf(p))),
  nav: ['fixtures/rinex/nav/brdc-excerpt-3.04.rnx', 'fixtures/rinex/nav/glw1277m-excerpt.18g', 'fixtures/rinex/nav/glw1277m-excerpt.18n', 'fixtures/rinex/nav/mixed-rinex4.00.rnx'].map((p) => latin1(bytesOf(p))),
  crx: ['fixtures/compress/HAND00XXX_R_20240100000_01H_30S_MO.crx', 'fixtures/compress/hand0100.24d'].map((p) => latin1(bytesOf(p))),
  control: [latin1(bytesOf('fixtures/geo/control-marks.csv')), latin1(bytesOf('fixtures/demo/control-marks.csv'))],
  windows: [latin1(bytesOf('fixtures/demo/occupations.csv'))],
  points: [latin1(bytesOf('fuzz/seeds/points.csv'))],
  helmert: [latin1(bytesOf('fuzz/seeds/helmert.json'))],
  geoid: [latin1(bytesOf('fixtures/geo/egm96-crop.isg'))],
};
const Z_SEEDS = SEEDS.obs.slice(0, 2).map((t) => lzwEncode(toBytes(t)));
const GZ_SEEDS = [...SEEDS.obs.slice(0, 2), SEEDS.nav[0]].map((t) => new Uint8Array(gzipSync(Buffer.from(t, 'latin1'))));

async function readObsBytes(file, b, r) {
  const warnings = [];
  const t = await core.openText(file, chunked(b, r), { onWarning: (w) => warnings.push(w) });
  const s = await core.readObsStream(file, t.text, { onWarning: (w) => warnings.push(w) });
  let n = 0;
  for await (const e of s.epochs) if (e) n++;
  return n;
}

async function readNavBytes(file, b, r) {
  const t = await core.openText(file, chunked(b, r), { onWarning: () => {} });
  return (await core.readNav(file, t.text, { onWarning: () => {} })).ephemerides.length;
}

async function readAnyText(file, b, r) {
  const t = await core.openText(file, chunked(b, r), { onWarning: () => {} });
  const head = [];
  let first = '';
  for await (const c of t.text) { if (!first) first = c.slice(0, 81); head.push(c); }
  const bytes = toBytes(head.join(''));
  // whatever came out goes on to the reader its first line asks for
  return first.slice(20, 21) === 'O' || first.includes('COMPACT') ? readObsBytes(file, bytes, r) : first.slice(60).startsWith('RINEX') ? readNavBytes(file, bytes, r) : 0;
}

/** Each target: a file name for its sentences and a function (rng) -> Promise of the reader's run. */
export const TARGETS = {
  observation: { file: 'fuzz-obs.rnx', run: (r, f) => readObsBytes(f, toBytes(damageText(r, pick(r, SEEDS.obs))), r) },
  navigation: { file: 'fuzz-nav.rnx', run: (r, f) => readNavBytes(f, toBytes(damageText(r, pick(r, SEEDS.nav))), r) },
  'compact-rinex': { file: 'fuzz-obs.crx', run: (r, f) => readObsBytes(f, toBytes(damageText(r, pick(r, SEEDS.crx))), r) },
  'unix-compress': { file: 'fuzz-obs.rnx.Z', run: (r, f) => readAnyText(f, damageBytes(r, pick(r, Z_SEEDS)), r) },
  gzip: { file: 'fuzz-file.gz', run: (r, f) => readAnyText(f, damageBytes(r, pick(r, GZ_SEEDS)), r) },
  'control-csv': { file: 'fuzz-marks.csv', run: async (r, f) => core.parseControlCsv(f, damageText(r, pick(r, SEEDS.control)), () => {}).length },
  'windows-csv': { file: 'fuzz-windows.csv', run: async (r, f) => core.parseOccupationCsv(f, damageText(r, pick(r, SEEDS.windows))).length },
  'points-csv': { file: 'fuzz-points.csv', run: async (r, f) => core.parsePointsCsv(f, damageText(r, pick(r, SEEDS.points))).length },
  'helmert-json': { file: 'fuzz-helmert.json', run: async (r, f) => core.parseHelmertJson(f, damageText(r, pick(r, SEEDS.helmert))).length },
  geoid: {
    file: 'fuzz-geoid.isg',
    run: async (r, f) => {
      const g = core.parseIsgGrid(f, damageText(r, pick(r, SEEDS.geoid)));
      try { g.undulationM(46.9, 102.4); } catch (e) { if (!(e instanceof RangeError)) throw e; }
      return 1;
    },
  },
};

/**
 * One input: 'ok', 'named' (a project error whose sentence names the file or a line), 'unnamed' (a project
 * error naming neither) or 'crash' (any other error), with the sentence.
 */
export async function runOne(target, seed, index) {
  const t = TARGETS[target];
  const r = prng((seed ^ Math.imul(index + 1, 0x9e3779b1) ^ hash(target)) >>> 0);
  try {
    await t.run(r, t.file);
    return { outcome: 'ok' };
  } catch (e) {
    const msg = e instanceof Error ? e.message : String(e);
    if (!(e instanceof core.RefdeltaError)) return { outcome: 'crash', message: `${e?.name ?? typeof e}: ${msg}` };
    const named = msg.includes(t.file) || (e instanceof core.InputError && e.line > 0);
    return { outcome: named ? 'named' : 'unnamed', message: msg };
  }
}

function hash(s) {
  let h = 2166136261;
  for (let i = 0; i < s.length; i++) h = Math.imul(h ^ s.charCodeAt(i), 16777619);
  return h >>> 0;
}

/**
 * The CLI-level corpus: real files from ../shared/data (never walking-run/) and ../shared/bad-input,
 * damaged in the ways files get damaged (truncated, bytes flipped, lines deleted, records swapped, a huge
 * line, other encodings and line ends), run through `refdelta inspect` and `refdelta solve`. A run must end
 * with exit 0 or 1, no stack trace, no "internal error", and a failure sentence that names a file or a line.
 */
import { spawn } from 'node:child_process';
import { existsSync, mkdtempSync, readdirSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { gunzipSync, gzipSync } from 'node:zlib';
import { tmpdir } from 'node:os';
import { basename, dirname, join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { prng } from './targets.mjs';

const ROOT = join(dirname(fileURLToPath(import.meta.url)), '..');
const CLI = join(ROOT, 'packages/cli/dist/main.js');
const SHARED = join(ROOT, '..', 'shared');
const D = join(SHARED, 'data');
const S = join(D, 'cors-and-rover-2018-277');

const SOURCES = [
  join(S, 'static-run/base.obs'), join(S, 'reference/glw1277m.18o'), join(S, 'reference/glw1277m.18n'), join(S, 'reference/glw1277m.18g'),
  join(D, 'hatanaka-pairs/ac660270.18o'), join(D, 'hatanaka-pairs/ac660270.18o.Z'), join(D, 'single-station/BRDM00DLR_R_20130010000_01D_MN.rnx'),
  join(D, 'single-station/CEDA00USA_R_20182100000_01D_MN.rnx.gz'), join(D, 'single-station/brdc0100.24n.gz'),
  join(D, 'single-station/BRUX00BEL_R_20202302000_01H_30S_MO.crx'),
  ...(existsSync(join(SHARED, 'bad-input')) ? readdirSync(join(SHARED, 'bad-input')).map((n) => join(SHARED, 'bad-input', n)) : []),
].filter((p) => existsSync(p) && !p.includes('walking-run'));

const isGz = (b) => b[0] === 0x1f && b[1] === 0x8b;

/** The damages, each (rng, bytes) -> bytes, with a name. */
const DAMAGES = {
  truncated: (r, b) => b.subarray(0, Math.floor(r() * b.length)),
  'bytes flipped': (r, b) => { const o = Uint8Array.from(b); for (let k = 0; k < 1 + r() * 20; k++) o[Math.floor(r() * o.length)] = Math.floor(r() * 256); return o; },
  'lines deleted': (r, b) => lines(b, (ls) => { for (let k = 0; k < 1 + r() * 10; k++) ls.splice(Math.floor(r() * ls.length), 1 + Math.floor(r() * 5)); }),
  'records swapped': (r, b) => lines(b, (ls) => { const i = Math.floor(r() * ls.length), j = Math.floor(r() * ls.length), n = 1 + Math.floor(r() * 20); const a = ls.slice(i, i + n); ls.splice(i, n, ...ls.slice(j, j + n)); ls.splice(j, n, ...a); }),
  'huge line': (r, b) => lines(b, (ls) => ls.splice(Math.floor(r() * ls.length), 0, 'x'.repeat((1 + Math.floor(r() * 3)) << 20))),
  'UTF-8 byte order mark': (r, b) => lines(b, (ls) => { ls[0] = '\ufeff' + ls[0]; }),
  'CR line ends': (r, b) => lines(b, () => {}, '\r'),
  'CRLF line ends': (r, b) => lines(b, () => {}, '\r\n'),
  'UTF-16LE': (r, b) => { const t = plain(b); return new Uint8Array(Buffer.concat([Buffer.from([0xff, 0xfe]), Buffer.from(t, 'utf16le')])); },
  'control characters in a name': (r, b) => lines(b, (ls) => { const i = ls.findIndex((l) => l.includes('MARKER NAME') || l.includes('COMMENT')); if (i >= 0) ls[i] = ('\x1b]0;x\x07' + ls[i]).slice(0, 80); }),
};

function plain(b) {
  try { return Buffer.from(isGz(b) ? gunzipSync(b) : b).toString('latin1'); } catch { return Buffer.from(b).toString('latin1'); }
}

/** Applies a text edit to the decompressed text (gzip kept as gzip). */
function lines(b, edit, sep = '\n') {
  const gz = isGz(b);
  const ls = plain(b).split(/\r?\n/);
  edit(ls);
  const out = Buffer.from(ls.join(sep), ls.join('').includes('\ufeff') ? 'utf8' : 'latin1');
  return new Uint8Array(gz ? gzipSync(out) : out);
}

function run(args, timeoutMs) {
  return new Promise((resolve) => {
    const c = spawn(process.execPath, [CLI, ...args], { stdio: ['ignore', 'pipe', 'pipe'] });
    let stderr = '';
    c.stdout.on('data', () => {});
    c.stderr.on('data', (d) => { stderr += d.toString(); });
    let hung = false;
    const timer = setTimeout(() => { hung = true; c.kill('SIGKILL'); }, timeoutMs);
    c.on('close', (code) => { clearTimeout(timer); resolve({ code, stderr, hung }); });
  });
}

export async function runCliCorpus({ seed, workers = 2, log = console.log, perSource = 20, solve = true }) {
  const r = prng(seed ^ 0x5eed);
  const dir = mkdtempSync(join(tmpdir(), 'rd-fuzz-cli-'));
  const cases = [];
  const names = Object.keys(DAMAGES);
  for (const src of SOURCES) {
    const b = new Uint8Array(readFileSync(src));
    for (let k = 0; k < perSource; k++) {
      const dmg = names[(k + Math.floor(r() * names.length)) % names.length];
      const f = join(dir, `${k}-${basename(src)}`);
      writeFileSync(f, DAMAGES[dmg](r, b));
      cases.push({ src, dmg, file: f, args: ['inspect', f] });
      if (solve && /base\.obs|glw1277m\.18[on]$/.test(src) && k % 4 === 0) {
        const rover = src.endsWith('base.obs') ? f : join(S, 'static-run/base.obs');
        const ref = src.endsWith('.18o') ? f : join(S, 'reference/glw1277m.18o');
        const nav = src.endsWith('.18n') ? f : join(S, 'reference/glw1277m.18n');
        cases.push({ src, dmg, file: f, args: ['solve', '--rover', rover, '--reference', ref, '--nav', nav, '--ref-coord', 'header', '--outputs', 'summary', '--quiet', '--out', join(dir, `out-${k}-${basename(src)}`)] });
      }
    }
  }
  const tally = { runs: 0, ok: 0, named: 0, unnamed: 0, crash: 0, hang: 0, examples: [] };
  const t0 = Date.now();
  const queue = [...cases];
  await Promise.all(Array.from({ length: workers }, async () => {
    for (let c = queue.shift(); c; c = queue.shift()) {
      const res = await run(c.args, 30_000);
      tally.runs++;
      const lastLine = res.stderr.trim().split('\n').pop() ?? '';
      let outcome;
      if (res.hung) outcome = 'hang';
      else if (![0, 1].includes(res.code) || /internal error|^\s+at /m.test(res.stderr)) outcome = 'crash';
      else if (res.code === 0) outcome = 'ok';
      else outcome = lastLine.startsWith('refdelta: ') && (lastLine.includes(basename(c.file)) || /line \d+|:\d+:/.test(lastLine)) ? 'named' : 'unnamed';
      tally[outcome]++;
      if (outcome !== 'ok' && outcome !== 'named' && tally.examples.length < 20) tally.examples.push({ command: c.args[0], source: basename(c.src), damage: c.dmg, outcome, stderr: res.stderr.slice(-400) });
    }
  }));
  rmSync(dir, { recursive: true, force: true });
  log(`cli corpus: ${tally.runs} runs (inspect and solve) on ${SOURCES.length} real files damaged ${names.length} ways: exit 0 ${tally.ok}, refused with a named sentence ${tally.named}, crashes ${tally.crash}, hangs ${tally.hang}, unnamed sentences ${tally.unnamed} (${((Date.now() - t0) / 1000).toFixed(0)} s)`);
  for (const e of tally.examples.slice(0, 10)) log(`    ${e.outcome}: ${e.command} on ${e.source} (${e.damage}): ${e.stderr.replace(/\n/g, ' | ')}`);
  return tally;
}

// Throughput check of the RINEX observation reader against a bare line scan of the same text.
// Usage: npx tsc -b packages/core && node bench/parse-obs.mjs [distDir] [file...]
// (distDir defaults to packages/core/dist; files default to plain RINEX files under ../shared/data).
import { readFileSync, existsSync } from 'node:fs';
import { resolve, dirname } from 'node:path';
import { fileURLToPath, pathToFileURL } from 'node:url';

const root = resolve(dirname(fileURLToPath(import.meta.url)), '..');
const args = process.argv.slice(2);
const dist = resolve(args[0] && !args[0].match(/\.(o|obs|rnx|\d\do)$/) ? args.shift() : resolve(root, 'packages/core/dist'));
const { readObsStream } = await import(pathToFileURL(resolve(dist, 'rinex/index.js')).href);
const data = resolve(root, '..', 'shared', 'data');
const files = args.length > 0 ? args : [
  'hatanaka-pairs/york0440.15o', 'hatanaka-pairs/brst155h.20o',
  'single-station/REYK00ISL_R_20192701000_01H_30S_MO.rnx', 'single-station/BRUX00BEL_R_20183101900_01H_30S_MO.rnx',
].map((f) => resolve(data, f)).filter(existsSync);

async function* chunks(s, n = 1 << 16) { for (let i = 0; i < s.length; i += n) yield s.slice(i, i + n); }

function lineScan(text) {
  // bare scan: find every line end and touch the line (what any reader must at least do)
  let pos = 0, n = 0, sum = 0;
  for (;;) { const nl = text.indexOf('\n', pos); if (nl < 0) break; const l = text.slice(pos, nl); sum += l.length; n++; pos = nl + 1; }
  return n + sum;
}

async function parse(text) {
  const st = await readObsStream('bench', chunks(text));
  let n = 0;
  for await (const e of st.epochs) n += e.sats.length;
  return n;
}

const best = async (fn, reps) => { let b = Infinity; for (let i = 0; i < reps; i++) { const t = performance.now(); await fn(); b = Math.min(b, performance.now() - t); } return b; };
for (const f of files) {
  const text = new TextDecoder().decode(readFileSync(f));
  const mb = text.length / 1e6;
  const scanMs = await best(() => lineScan(text), 10);
  const parseMs = await best(() => parse(text), 8);
  console.log(`${f.split('/').pop()}: ${mb.toFixed(1)} MB; line scan ${(mb / scanMs * 1000).toFixed(0)} MB/s; parser ${(mb / parseMs * 1000).toFixed(0)} MB/s (${(100 * scanMs / parseMs).toFixed(0)} % of scan)`);
}

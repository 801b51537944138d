#!/usr/bin/env node
/**
 * Kills `refdelta solve` and `refdelta batch` at random moments (SIGKILL, SIGTERM or SIGINT), then runs
 * the same command again, and checks: no temporary file left after that next run, every output set on
 * disk described exactly by its summary (the files it lists are there with their SHA-256, no other
 * output beside them), and the outputs byte-identical to an uninterrupted run (summaries compared
 * without their creation time). Also counts the states found right after each kill. Inputs: the
 * invented demo files (fixtures/demo). Usage: node fuzz/kill-test.mjs [--kills 30] [--seed S]
 */
import { spawn } from 'node:child_process';
import { createHash } from 'node:crypto';
import { copyFileSync, existsSync, mkdirSync, mkdtempSync, readdirSync, readFileSync, rmSync, statSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { dirname, join, relative } from 'node:path';
import { fileURLToPath } from 'node:url';
import { prng } from './targets.mjs';

const ROOT = join(dirname(fileURLToPath(import.meta.url)), '..');
const CLI = join(ROOT, 'packages/cli/dist/main.js');
const demo = (f) => join(ROOT, 'fixtures/demo', f);
const arg = (n, d) => { const i = process.argv.indexOf(`--${n}`); return i >= 0 ? process.argv[i + 1] : d; };
const KILLS = Number(arg('kills', 30));
const SEED = Number(arg('seed', Math.floor(Math.random() * 2 ** 31)));
const r = prng(SEED);

const work = mkdtempSync(join(tmpdir(), 'rd-kill-'));
const sessions = join(work, 'sessions');
mkdirSync(sessions);
copyFileSync(demo('rover-1s.obs'), join(sessions, 'walk-a.obs'));
copyFileSync(demo('rover-1s.obs'), join(sessions, 'walk b.obs'));
const common = ['--reference', demo('KFRD-reference-5s.obs'), '--nav', demo('broadcast-mixed.nav'), '--ref-coord', 'KFRD', '--marks', demo('control-marks.csv'), '--quiet'];
const COMMANDS = {
  solve: (out) => ['solve', '--rover', demo('rover-1s.obs'), ...common, '--out', out],
  batch: (out) => ['batch', '--sessions', sessions, ...common, '--outputs', 'epochs,summary', '--out', out],
};
const MEMBERS = new Set(['epochs.csv', 'residuals.csv', 'positions.geojson', 'summary.json', 'points.csv', 'points.geojson', 'batch-points.csv', 'batch-summary.json']);

function start(args) {
  const c = spawn(process.execPath, [CLI, ...args], { stdio: 'ignore' });
  return { child: c, done: new Promise((res) => c.on('close', (code, sig) => res({ code, sig }))) };
}
const sha = (p) => createHash('sha256').update(readFileSync(p)).digest('hex');
function walk(dir) {
  const out = [];
  for (const n of existsSync(dir) ? readdirSync(dir) : []) {
    const p = join(dir, n);
    if (statSync(p).isDirectory()) out.push(...walk(p)); else out.push(p);
  }
  return out;
}
const temporaries = (dir) => walk(dir).filter((p) => /\.tmp$/.test(p) || /\.refdelta-commit\./.test(p));

/** Problems of the sets in `dir`: a summary whose list does not match the files beside it. */
function describedExactly(dir) {
  const problems = [];
  const folders = [dir, ...(existsSync(dir) ? readdirSync(dir).map((n) => join(dir, n)).filter((p) => statSync(p).isDirectory()) : [])];
  for (const f of folders) {
    const present = readdirSync(f).filter((n) => MEMBERS.has(n));
    const index = ['summary.json', 'batch-summary.json'].find((n) => present.includes(n));
    if (!index) {
      if (present.length) problems.push(`${relative(dir, f) || '.'}: ${present.join(', ')} without a summary`);
      continue;
    }
    const doc = JSON.parse(readFileSync(join(f, index), 'utf8'));
    const listed = new Set();
    for (const o of doc.outputs ?? []) {
      const name = relative(f, o.path);
      listed.add(name);
      if (name === index) continue;
      if (!existsSync(o.path)) problems.push(`${relative(dir, f) || '.'}: ${name} listed but missing`);
      else if (o.sha256 && sha(o.path) !== o.sha256) problems.push(`${relative(dir, f) || '.'}: ${name} differs from its summary`);
    }
    for (const n of present) if (!listed.has(n)) problems.push(`${relative(dir, f) || '.'}: ${n} not in ${index}`);
    if (index === 'batch-summary.json') {
      for (const s of doc.sessions ?? []) if (s.out && !existsSync(join(s.out, 'summary.json'))) problems.push(`session ${s.name} listed but its summary is missing`);
      const listedSessions = new Set((doc.sessions ?? []).filter((s) => s.out).map((s) => relative(dir, s.out)));
      for (const sub of folders.slice(1)) if (!listedSessions.has(relative(dir, sub))) problems.push(`session folder ${relative(dir, sub)} not in batch-summary.json`);
    }
  }
  return problems;
}

/** Output bytes by relative path; summaries without their creation time. */
function snapshot(dir) {
  const m = new Map();
  for (const p of walk(dir)) {
    let b = readFileSync(p, 'utf8');
    if (p.endsWith('.json')) b = b.replace(/"created_utc": "[^"]*"/g, '"created_utc": ""');
    m.set(relative(dir, p), createHash('sha256').update(b).digest('hex'));
  }
  return m;
}
const same = (a, b) => a.size === b.size && [...a].every(([k, v]) => b.get(k) === v);

const reference = {};
const durations = {};
for (const [name, cmd] of Object.entries(COMMANDS)) {
  const out = join(work, `out-${name}`);
  const t = Date.now();
  const { code } = await start(cmd(out)).done;
  if (code !== 0) throw new Error(`reference ${name} run failed (exit ${code})`);
  durations[name] = Date.now() - t;
  reference[name] = snapshot(out);
}

const stats = { kills: 0, describedRightAfter: 0, pendingJournal: 0, problemsRightAfter: [], tempsAfterNext: 0, problemsAfterNext: [], notIdentical: 0, exits: {} };
for (let k = 0; k < KILLS; k++) {
  const name = k % 2 === 0 ? 'solve' : 'batch';
  const out = join(work, `out-${name}`);
  const sig = ['SIGKILL', 'SIGTERM', 'SIGINT'][Math.floor(r() * 3)];
  const atMs = Math.floor(r() * durations[name] * 1.1);
  const run = start(COMMANDS[name](out));
  await new Promise((res) => setTimeout(res, atMs));
  run.child.kill(sig);
  const ended = await run.done;
  stats.kills++;
  const key = `${sig} -> ${ended.code ?? ended.sig}`;
  stats.exits[key] = (stats.exits[key] ?? 0) + 1;
  const pending = temporaries(out).some((p) => p.includes('.refdelta-commit.'));
  const right = describedExactly(out);
  if (pending) stats.pendingJournal++;
  else if (right.length === 0) stats.describedRightAfter++;
  else stats.problemsRightAfter.push(`${name} ${sig} at ${atMs} ms: ${right.join('; ')}`);
  // the next run
  const { code } = await start(COMMANDS[name](out)).done;
  if (code !== 0) stats.problemsAfterNext.push(`${name}: next run exit ${code}`);
  stats.tempsAfterNext += temporaries(out).length;
  const after = describedExactly(out);
  if (after.length) stats.problemsAfterNext.push(`${name}: ${after.join('; ')}`);
  if (!same(snapshot(out), reference[name])) stats.notIdentical++;
}
rmSync(work, { recursive: true, force: true });
console.log(`kill test: seed ${SEED}, ${stats.kills} kills of solve and batch at random moments (reference runs ${durations.solve} / ${durations.batch} ms)`);
console.log(`  exits: ${Object.entries(stats.exits).map(([k, v]) => `${k}: ${v}`).join(', ')}`);
console.log(`  right after the kill: ${stats.describedRightAfter} described exactly by their summaries, ${stats.pendingJournal} with a commit journal for the next run to finish, ${stats.problemsRightAfter.length} otherwise`);
for (const p of stats.problemsRightAfter) console.log(`    ${p}`);
console.log(`  after the next run: ${stats.tempsAfterNext} temporary files left, ${stats.problemsAfterNext.length} sets not described exactly, ${stats.notIdentical} runs not byte-identical to an uninterrupted run`);
for (const p of stats.problemsAfterNext) console.log(`    ${p}`);
process.exitCode = stats.tempsAfterNext + stats.problemsAfterNext.length + stats.notIdentical + stats.problemsRightAfter.length === 0 ? 0 : 1;

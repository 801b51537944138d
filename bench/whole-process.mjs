// Part 3: whole-process runs of the built `refdelta` command (start-up, reading, engine and outputs
// included) on real files and simulated days, each beside a floor measured in the same run:
//   start-up      `node -e 0`
//   solve         bench/floor-solve.mjs on the same files (plain reading of every field, orbits at both
//                 ends, 4x4 least squares, writing the same bytes), GPS as refdelta is asked (--systems G)
//   outputs       the same refdelta run with --outputs summary
//   batch         8 sessions with --jobs 1 against --jobs 2 (wall time: what parallel runs buy)
//   memory        peak RSS of a 24 h simulated session against a 1 h one (kernel high-water mark)
// CPU time is user + system of the child (/usr/bin/time), the figure that holds on a shared machine;
// wall time is printed beside it. Every figure is the median of `runs` runs.
import { spawn, spawnSync } from 'node:child_process';
import { copyFileSync, existsSync, mkdirSync, mkdtempSync, readdirSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join, resolve } from 'node:path';
import { gunzipSync } from 'node:zlib';
import { ROOT } from './load-core.mjs';
import { benchScenarioSpec, scenarioTexts } from './scenario.mjs';
import { median } from './stats.mjs';

// The command as `node packages/cli/bin/refdelta.js`: a command working on files runs in a child node with
// the young-generation bound the command gives itself (packages/cli/bin/heap-growth.js); the CPU time and
// peak RSS of a run include that child (/usr/bin/time counts waited-for descendants).
const CLI = resolve(ROOT, 'packages/cli/bin/refdelta.js');
const FLOOR = resolve(ROOT, 'bench/floor-solve.mjs');
const TIME = '/usr/bin/time';

/** Runs a command `runs` times; medians of CPU (user + system, s), wall (s) and peak RSS (MB). */
export function measure(cmd, args, runs, before = () => {}) {
  const cpu = [], wall = [], rss = [];
  let last = null;
  for (let i = 0; i < runs; i++) {
    before();
    const out = join(tmpdir(), `refdelta-bench-time-${process.pid}.txt`);
    const r = spawnSync(TIME, ['-f', '%U %S %e %M', '-o', out, cmd, ...args], { encoding: 'utf8', maxBuffer: 1 << 26 });
    if (r.status !== 0) throw new Error(`${cmd} ${args.join(' ')} exited ${r.status}: ${r.stderr.slice(-2000)}`);
    const [u, s, e, m] = readFileSync(out, 'utf8').trim().split('\n').pop().split(/\s+/).map(Number);
    cpu.push(u + s); wall.push(e); rss.push(m / 1024);
    last = r;
  }
  return { cpuS: median(cpu), wallS: median(wall), rssMB: median(rss), cpuRuns: cpu, stdout: last.stdout };
}

/**
 * Several commands measured in turns (a, b, c, a, b, c, ...), `runs` times each: on a shared machine the
 * load changes from minute to minute, and figures compared as a ratio must see the same load (measuring
 * all of one, then all of the other, once gave --jobs 2 a wall time twice that of --jobs 1).
 * `cases` are [cmd, args, before?]; returns one measure() result per case.
 */
export function measureInTurns(cases, runs) {
  const per = cases.map(() => []);
  for (let i = 0; i < runs; i++) cases.forEach(([cmd, args, before], k) => per[k].push(measure(cmd, args, 1, before)));
  return per.map((ms) => ({
    cpuS: median(ms.map((m) => m.cpuS)), wallS: median(ms.map((m) => m.wallS)), rssMB: median(ms.map((m) => m.rssMB)),
    cpuRuns: ms.map((m) => m.cpuS), stdout: ms[ms.length - 1].stdout,
  }));
}

/**
 * CPU time per thread of a command and of the processes it starts (Linux: utime + stime of
 * /proc/PID/task/TID/stat, fields 14 and 15, read every 20 ms until the command exits, descendants found
 * through /proc/PID/task/TID/children; each thread keeps its last reading, so a thread's last 20 ms may be
 * missed). The main JavaScript thread is the first thread of the last process started (the refdelta
 * command runs in a child node of its own: packages/cli/bin/heap-growth.js); the other threads are
 * worker threads and V8's helpers (optimising compiler, garbage collector), which a single-threaded
 * program also runs on other cores. Returns { mainS, largestS (the busiest thread), totalS } or null
 * without /proc.
 */
export async function threadCpu(cmd, args, before = () => {}) {
  if (!existsSync('/proc/self/task')) return null;
  before();
  const tickS = 1 / Number(spawnSync('getconf', ['CLK_TCK'], { encoding: 'utf8' }).stdout.trim() || 100);
  const child = spawn(cmd, args, { stdio: 'ignore' });
  const last = new Map();
  let commandPid = String(child.pid);
  const visit = (pid) => {
    let tids;
    try { tids = readdirSync(`/proc/${pid}/task`); } catch { return; }
    for (const tid of tids) {
      try {
        const stat = readFileSync(`/proc/${pid}/task/${tid}/stat`, 'latin1');
        const f = stat.slice(stat.lastIndexOf(')') + 2).split(' ');
        last.set(`${pid}/${tid}`, (Number(f[11]) + Number(f[12])) * tickS);
      } catch { /* the thread has ended */ }
      let children = [];
      try { children = readFileSync(`/proc/${pid}/task/${tid}/children`, 'latin1').trim().split(/\s+/).filter(Boolean); } catch { /* none */ }
      for (const c of children) { commandPid = c; visit(c); }
    }
  };
  const poll = () => visit(child.pid);
  const timer = setInterval(poll, 20);
  const code = await new Promise((done) => child.on('exit', done));
  clearInterval(timer);
  if (code !== 0) throw new Error(`${cmd} ${args.join(' ')} exited ${code}`);
  const values = [...last.values()];
  return { mainS: last.get(`${commandPid}/${commandPid}`) ?? NaN, largestS: Math.max(...values), totalS: values.reduce((a, b) => a + b, 0) };
}

/** APPROX POSITION XYZ of a RINEX observation header, as 'X,Y,Z'. */
function headerXyz(path) {
  const line = readFileSync(path, 'latin1').split('\n', 200).find((l) => l.slice(60).startsWith('APPROX POSITION XYZ'));
  return line.slice(0, 42).trim().split(/\s+/).join(',');
}

const solveArgs = (rover, reference, nav, xyz, out, extra = []) => [
  CLI, 'solve', '--rover', rover, '--reference', reference, '--nav', ...nav, '--ref-coord', xyz, '--ref-frame', 'WGS84', '--ref-epoch', '2024.0',
  '--out', out, '--quiet', ...extra,
];

/** A solve case: refdelta (all outputs, then summary only unless `withSummary` is false) and the floor on the same files. */
function solveCase(name, rover, reference, nav, xyz, work, runs, extra = ['--systems', 'G'], withSummary = true) {
  const full = join(work, `${name}-full`), summary = join(work, `${name}-summary`), floorOut = join(work, `${name}-floor`);
  mkdirSync(floorOut, { recursive: true });
  const fullRun = [process.execPath, solveArgs(rover, reference, nav, xyz, full, extra)];
  const [a, s = null] = measureInTurns(withSummary ? [fullRun, [process.execPath, solveArgs(rover, reference, nav, xyz, summary, [...extra, '--outputs', 'summary'])]] : [fullRun], runs);
  // The floor writes the bytes refdelta wrote (its outputs but the summary, which the summary-only run also writes).
  const like = join(work, `${name}-like`);
  mkdirSync(like, { recursive: true });
  for (const f of ['epochs.csv', 'residuals.csv', 'positions.geojson']) copyFileSync(join(full, f), join(like, f));
  const f = measure(process.execPath, [FLOOR, rover, reference, xyz, floorOut, like, ...nav], runs);
  return { name, full: a, summary: s, floor: f, floorInfo: JSON.parse(f.stdout) };
}

/** The text of a simulated session's three files, written under `dir`. */
async function writeScenario(core, dir, spec) {
  const sim = core.simulateScenario(spec);
  const t = scenarioTexts(core, sim);
  const write = (name, chunks) => { const p = join(dir, name); writeFileSync(p, [...chunks].join('')); return p; };
  return { rover: write('rover.obs', t.rover()), reference: write('reference.obs', t.reference()), nav: write('nav.rnx', t.nav()), sim };
}

const ecefText = (core, spec) => {
  const g = spec.reference.markGeodetic;
  const p = core.geodeticToEcef({ latRad: (g.latDeg * Math.PI) / 180, lonRad: (g.lonDeg * Math.PI) / 180, heightM: g.heightM + spec.reference.antennaHeightM });
  return `${p.x.toFixed(4)},${p.y.toFixed(4)},${p.z.toFixed(4)}`;
};

/**
 * Every Part 3 measure; `runs` per figure (>= 5 for the targets). Files that are absent are skipped.
 * Returns { rows (table), verdicts }.
 */
export async function benchWholeProcess(core, dataDir, { runs = 5, simHours = 24 } = {}) {
  if (!existsSync(TIME)) return { skipped: `${TIME} not found (apt-get install time): whole-process CPU times need it` };
  const work = mkdtempSync(join(tmpdir(), 'refdelta-bench-'));
  const rows = [], verdicts = [];
  const ratio = (x, y) => x / y;
  const row = (what, m, floorWhat, f, target = '') => rows.push([what, m.cpuS.toFixed(2), m.wallS.toFixed(2), m.rssMB.toFixed(0), floorWhat, f ? f.cpuS.toFixed(2) : '', f ? `${ratio(m.cpuS, f.cpuS).toFixed(2)}x` : '', target]);
  try {
    // Start-up.
    const node0 = measure(process.execPath, ['-e', '0'], Math.max(runs, 7));
    const version = measure(process.execPath, [CLI, '--version'], Math.max(runs, 7));
    row('refdelta --version', version, 'node -e 0', node0, '<= 3x');
    verdicts.push(['start-up: refdelta --version / node -e 0 (CPU)', `${ratio(version.cpuS, node0.cpuS).toFixed(2)}x`, '<= 3x', ratio(version.cpuS, node0.cpuS) <= 3]);

    // Real files: DGAR against itself (GPS), BELE against itself (GPS), the static run (GPS).
    const ss = (f) => join(dataDir, 'single-station', f);
    const cases = [];
    if (existsSync(ss('dgar0100.24o.gz')) && existsSync(ss('brdc0100.24n.gz'))) {
      const obs = join(work, 'dgar0100.24o'), nav = join(work, 'brdc0100.24n');
      writeFileSync(obs, gunzipSync(readFileSync(ss('dgar0100.24o.gz'))));
      writeFileSync(nav, gunzipSync(readFileSync(ss('brdc0100.24n.gz'))));
      cases.push(['DGAR day vs itself, GPS', solveCase('dgar', obs, obs, [nav], headerXyz(obs), work, runs), true]);
      // Both files hold carrier phase, so the run above is a carrier-phase one (float filter, integer
      // ambiguities, forward and backward passes); the floor is a code solve: the code engine beside it.
      cases.push(['DGAR day vs itself, GPS, code only (--carrier-phase off)', solveCase('dgar-code', obs, obs, [nav], headerXyz(obs), work, runs, ['--systems', 'G', '--carrier-phase', 'off'], false), false]);
    }
    const bele = ss('BELE00BRA_R_20240100000_01D_30S_MO.crx.gz');
    if (existsSync(bele) && existsSync(ss('BRDC00IGS_R_20240100000_01D_MN.rnx.gz'))) {
      const plain = join(work, 'BELE00BRA_R_20240100000_01D_30S_MO.rnx'), nav = join(work, 'BRDC00IGS_R_20240100000_01D_MN.rnx');
      const opened = await core.openText(bele, (async function* () { yield new Uint8Array(readFileSync(bele)); })());
      const parts = [];
      for await (const c of opened.text) parts.push(c);
      writeFileSync(plain, parts.join(''));
      writeFileSync(nav, gunzipSync(readFileSync(ss('BRDC00IGS_R_20240100000_01D_MN.rnx.gz'))));
      const c = solveCase('bele', plain, plain, [nav], headerXyz(plain), work, runs);
      cases.push(['BELE day vs itself (plain RINEX 3), GPS', c, false]);
      c.crx = measure(process.execPath, solveArgs(bele, bele, [nav], headerXyz(plain), join(work, 'bele-crx'), ['--systems', 'G']), runs);
    }
    const sr = join(dataDir, 'cors-and-rover-2018-277');
    if (existsSync(join(sr, 'static-run/rover.obs'))) {
      cases.push(['static run, rover vs base (1 Hz), GPS', solveCase('static', join(sr, 'static-run/rover.obs'), join(sr, 'static-run/base.obs'),
        [join(sr, 'reference/glw1277m.18n')], '3774089.2120,-601661.6157,5089321.2474', work, runs), false]);
    }

    // Simulated: the bench scenario (rover 1 Hz, reference 30 s, GPS + Galileo) for a day and for 1 h, and
    // a real-like one (reference at 1 Hz too). The simulator has no GLONASS.
    const simDir = (n) => { const d = join(work, n); mkdirSync(d, { recursive: true }); return d; };
    const daySpec = benchScenarioSpec(core, Math.round(simHours * 3600));
    const day = await writeScenario(core, simDir('sim-day'), daySpec);
    cases.push([`simulated ${simHours} h (rover 1 Hz, ref 30 s, GPS+Galileo), GPS`, solveCase('simday', day.rover, day.reference, [day.nav], ecefText(core, daySpec), work, runs, ['--systems', 'G'], false), false]);
    const hourSpec = benchScenarioSpec(core, 3600);
    const hour = await writeScenario(core, simDir('sim-hour'), hourSpec);
    const likeSpec = { ...benchScenarioSpec(core, 2 * 3600), reference: { ...hourSpec.reference, intervalS: 1 } };
    const like = await writeScenario(core, simDir('sim-like'), likeSpec);
    const likeRun = measure(process.execPath, solveArgs(like.rover, like.reference, [like.nav], ecefText(core, likeSpec), join(work, 'like-all')), runs);
    const likeCase = solveCase('like', like.rover, like.reference, [like.nav], ecefText(core, likeSpec), work, runs);
    cases.push(['real-like 2 h (rover and ref 1 Hz, GPS+Galileo), GPS', likeCase, false]);

    for (const [what, c, target] of cases) {
      row(what, c.full, 'floor script', c.floor, target ? '<= 2x' : '');
      if (c.summary) row('  all outputs against --outputs summary', c.full, 'summary only', c.summary, target ? '<= 1.1x' : '');
      if (c.crx) row('  same from the .crx.gz (gunzip + compact RINEX decoding)', c.crx, 'floor (plain text)', c.floor);
      if (target) {
        verdicts.push([`whole solve / floor CPU, ${what}`, `${ratio(c.full.cpuS, c.floor.cpuS).toFixed(2)}x`, '<= 2x', ratio(c.full.cpuS, c.floor.cpuS) <= 2]);
        verdicts.push([`outputs: all / summary only CPU, ${what}`, `${ratio(c.full.cpuS, c.summary.cpuS).toFixed(2)}x`, '<= 1.1x', ratio(c.full.cpuS, c.summary.cpuS) <= 1.1]);
      }
    }
    row('real-like 2 h, GPS+Galileo (both systems solved)', likeRun, 'floor (GPS)', likeCase.floor);

    // Memory: whole-process peak RSS of the 24 h simulated run against the 1 h one (all outputs).
    const hourRun = measure(process.execPath, solveArgs(hour.rover, hour.reference, [hour.nav], ecefText(core, hourSpec), join(work, 'hour-full'), ['--systems', 'G']), runs);
    const rssRatio = cases.find((c) => c[1].name === 'simday')[1].full.rssMB / hourRun.rssMB;
    rows.push([`peak RSS ${simHours} h / 1 h simulated (whole process)`, '', '', `${cases.find((c) => c[1].name === 'simday')[1].full.rssMB.toFixed(0)} / ${hourRun.rssMB.toFixed(0)}`, '', '', `${rssRatio.toFixed(2)}x`, '<= 1.3x']);
    verdicts.push([`peak RSS ${simHours} h / 1 h (whole process, median of ${runs})`, `${rssRatio.toFixed(2)}x`, '<= 1.3x', rssRatio <= 1.3]);
    // The same two runs with node's default young generation (node given a flag of its own: the command
    // then runs in this process, without the bound it gives itself; information).
    const plainRuns = Math.min(runs, 3);
    const [dayPlain, hourPlain] = measureInTurns([
      [process.execPath, ['--max-semi-space-size=16', ...solveArgs(day.rover, day.reference, [day.nav], ecefText(core, daySpec), join(work, 'simday-plain'), ['--systems', 'G'])]],
      [process.execPath, ['--max-semi-space-size=16', ...solveArgs(hour.rover, hour.reference, [hour.nav], ecefText(core, hourSpec), join(work, 'hour-plain'), ['--systems', 'G'])]],
    ], plainRuns);
    rows.push([`  same, node --max-semi-space-size=16 (node 20's default young generation, median of ${plainRuns})`, `${dayPlain.cpuS.toFixed(2)} / ${hourPlain.cpuS.toFixed(2)}`, '', `${dayPlain.rssMB.toFixed(0)} / ${hourPlain.rssMB.toFixed(0)}`, '', '', `${(dayPlain.rssMB / hourPlain.rssMB).toFixed(2)}x`, '(info)']);

    // Batch: 8 sessions (the demo rover, 1387 epochs each) with 1 and 2 workers.
    const demo = (f) => resolve(ROOT, 'fixtures/demo', f);
    const sessions = simDir('batch-sessions');
    for (let i = 1; i <= 8; i++) copyFileSync(demo('rover-1s.obs'), join(sessions, `walk-${i}.obs`));
    const batchArgs = (jobs) => [CLI, 'batch', '--sessions', sessions, '--reference', demo('KFRD-reference-5s.obs'), '--nav', demo('broadcast-mixed.nav'),
      '--ref-coord', 'KFRD', '--marks', demo('control-marks.csv'), '--jobs', String(jobs), '--out', join(work, `batch-${jobs}`), '--quiet'];
    const clear = (jobs) => () => rmSync(join(work, `batch-${jobs}`), { recursive: true, force: true });
    const [b1, b2] = measureInTurns([[process.execPath, batchArgs(1), clear(1)], [process.execPath, batchArgs(2), clear(2)]], runs);
    const speedup = b1.wallS / b2.wallS;
    rows.push(['batch of 8 sessions, --jobs 2 (wall s)', b2.cpuS.toFixed(2), b2.wallS.toFixed(2), b2.rssMB.toFixed(0), '--jobs 1 (wall s)', b1.wallS.toFixed(2), `${speedup.toFixed(2)}x faster`, '>= 1.7x']);
    // Same bytes but the summaries (their creation times differ from run to run).
    const same = spawnSync('diff', ['-r', '-q', '-x', '*summary.json', join(work, 'batch-1'), join(work, 'batch-2')]).status === 0;
    // With the kernel's autogroup scheduling (Linux default, /proc/sys/kernel/sched_autogroup_enabled) a busy
    // machine gives each session an equal share of the CPU whatever its thread count: there a second
    // worker cannot shorten the wall time, it only adds its own warm-up. Two free cores allow at most
    // 2 x CPU(--jobs 1) / CPU(--jobs 2), printed beside the measured figure.
    const bound = (2 * b1.cpuS) / b2.cpuS;
    // --jobs 1 is not one busy core: V8 optimises the hot functions and collects garbage on helper threads,
    // which run on the second core beside the main thread. On two free cores its wall time is at least its
    // main thread's CPU time (and half its total); --jobs 2 needs at least half of its total CPU time (and
    // its busiest thread's). The ratio of these floors is the speed-up two free cores would give.
    const threads1 = [], threads2 = [];
    for (let i = 0; i < runs; i++) {
      threads1.push(await threadCpu(process.execPath, batchArgs(1), clear(1)));
      threads2.push(await threadCpu(process.execPath, batchArgs(2), clear(2)));
    }
    let threadNote = '';
    if (threads1[0]) {
      const med = (xs, k) => median(xs.map((x) => x[k]));
      const main1 = med(threads1, 'mainS'), total1 = med(threads1, 'totalS'), total2 = med(threads2, 'totalS'), largest2 = med(threads2, 'largestS');
      const floor1 = Math.max(main1, total1 / 2), floor2 = Math.max(largest2, total2 / 2);
      rows.push(['  --jobs 1: main thread / all threads (CPU s)', `${main1.toFixed(2)} / ${total1.toFixed(2)}`, '', '', '--jobs 2: all threads', total2.toFixed(2), `${(floor1 / floor2).toFixed(2)}x on two free cores`, '']);
      threadNote = `; --jobs 1 main thread ${main1.toFixed(1)} s of ${total1.toFixed(1)} s: about ${(floor1 / floor2).toFixed(2)}x on two free cores`;
    }
    verdicts.push(['batch of 8: wall --jobs 1 / --jobs 2 (needs two free cores: the load decides it)', `${speedup.toFixed(2)}x (CPU ${b1.cpuS.toFixed(1)} vs ${b2.cpuS.toFixed(1)} s: at most ${bound.toFixed(2)}x on two free cores if --jobs 1 used one core${threadNote})${same ? ', same bytes' : ', OUTPUTS DIFFER'}`, '>= 1.7x, same bytes', speedup >= 1.7 && same]);
    return { rows, verdicts, cases };
  } finally {
    rmSync(work, { recursive: true, force: true });
  }
}

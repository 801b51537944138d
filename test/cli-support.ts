/** Running the built CLI as a subprocess (npm test builds first). */
import { spawnSync } from 'node:child_process';
import { existsSync, mkdtempSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join, resolve } from 'node:path';
import { REPO_ROOT } from './support/shared.js';

/** The installed command's entry (bin/refdelta.js runs the built dist/main.js). */
export const CLI_MAIN = resolve(REPO_ROOT, 'packages/cli/bin/refdelta.js');
const CLI_BUILT = resolve(REPO_ROOT, 'packages/cli/dist/main.js');

export interface CliRun {
  readonly status: number | null;
  readonly stdout: string;
  readonly stderr: string;
}

export function requireBuiltCli(): void {
  if (!existsSync(CLI_BUILT)) throw new Error(`${CLI_BUILT} is missing: run 'npm run build' (npm test builds first)`);
}

export function runCli(args: readonly string[], timeoutMs = 120_000): CliRun {
  const r = spawnSync(process.execPath, [CLI_MAIN, ...args], { cwd: REPO_ROOT, encoding: 'utf8', timeout: timeoutMs });
  return { status: r.status, stdout: r.stdout ?? '', stderr: r.stderr ?? '' };
}

export function tempDir(prefix: string): string {
  return mkdtempSync(join(tmpdir(), prefix));
}

/** Lines of a CSV with '#' comment lines, as objects (numeric columns, no quoting needed except the last 'reason'). */
export function parseCsv(text: string): { comments: string[]; header: string[]; rows: Record<string, string>[] } {
  const lines = text.split('\n').filter((l) => l !== '');
  const comments = lines.filter((l) => l.startsWith('#'));
  const body = lines.filter((l) => !l.startsWith('#'));
  const split = (l: string): string[] => {
    // RFC 4180: fields may be double-quoted; "" is a quote inside a quoted field.
    const out: string[] = [];
    let cur = '';
    let q = false;
    for (let i = 0; i < l.length; i++) {
      const c = l[i];
      if (q) {
        if (c === '"' && l[i + 1] === '"') { cur += '"'; i++; } else if (c === '"') q = false; else cur += c;
      } else if (c === '"') q = true;
      else if (c === ',') { out.push(cur); cur = ''; } else cur += c;
    }
    out.push(cur);
    return out;
  };
  const header = split(body[0] ?? '');
  const rows = body.slice(1).map((l) => {
    const cells = split(l);
    return Object.fromEntries(header.map((h, i) => [h, cells[i] ?? '']));
  });
  return { comments, header, rows };
}

/** ENU of an ECEF difference at geodetic latitude/longitude (radians): standard rotation (e.g. IS-GPS-200 / any geodesy text). */
export function enuAt(d: [number, number, number], latRad: number, lonRad: number): [number, number, number] {
  const [sl, cl, sp, cp] = [Math.sin(lonRad), Math.cos(lonRad), Math.sin(latRad), Math.cos(latRad)];
  return [
    -sl * d[0] + cl * d[1],
    -sp * cl * d[0] - sp * sl * d[1] + cp * d[2],
    cp * cl * d[0] + cp * sl * d[1] + sp * d[2],
  ];
}

export function median(xs: readonly number[]): number {
  const s = [...xs].sort((a, b) => a - b);
  const n = s.length;
  return n === 0 ? NaN : n % 2 ? s[(n - 1) / 2] : (s[n / 2 - 1] + s[n / 2]) / 2;
}

/** Nearest-rank percentile (a different definition from the one in the core on purpose: an independent check). */
export function nearestRank(xs: readonly number[], p: number): number {
  const s = [...xs].sort((a, b) => a - b);
  return s.length ? s[Math.max(0, Math.ceil(p * s.length) - 1)] : NaN;
}

/** The failure contract: the exit code, one sentence on stderr starting 'refdelta: ', no stack trace. */
export function expectOneSentence(r: CliRun): string {
  const lines = r.stderr.split('\n').filter((l) => l.trim() !== '');
  if (lines.length !== 1) throw new Error(`expected one line on stderr, got ${lines.length}:\n${r.stderr}`);
  if (!lines[0].startsWith('refdelta: ')) throw new Error(`expected 'refdelta: ...', got ${lines[0]}`);
  if (/\n\s+at /.test(r.stderr) || /\.(js|ts):\d+:\d+/.test(r.stderr)) throw new Error(`stack trace on stderr:\n${r.stderr}`);
  return lines[0];
}

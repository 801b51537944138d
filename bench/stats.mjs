// Timing helpers for the benchmark scripts (not tests): median of repeated runs after a warm-up.

export const median = (values) => {
  const s = [...values].sort((a, b) => a - b);
  const m = s.length >> 1;
  return s.length % 2 ? s[m] : 0.5 * (s[m - 1] + s[m]);
};

const cpuMs = () => { const u = process.cpuUsage(); return (u.user + u.system) / 1000; };

/**
 * Runs `fn` once to warm up, then at least `minRuns` times and until `minTotalMs` has passed
 * (at most `maxRuns`); returns the run times (ms, wall) and their median, and the process CPU time
 * (user + system, ms) of each run and its median: the figure that holds on a shared machine.
 */
export async function repeat(fn, { minRuns = 5, minTotalMs = 3000, maxRuns = 50 } = {}) {
  await fn();
  const times = [], cpuTimes = [];
  const t0 = performance.now();
  while (times.length < maxRuns && (times.length < minRuns || performance.now() - t0 < minTotalMs)) {
    globalThis.gc?.();
    const c = cpuMs();
    const t = performance.now();
    await fn();
    times.push(performance.now() - t);
    cpuTimes.push(cpuMs() - c);
  }
  return { times, medianMs: median(times), cpuTimes, medianCpuMs: median(cpuTimes) };
}

export const fmt = (v, digits = 0) => (Number.isFinite(v) ? v.toLocaleString('en-US', { minimumFractionDigits: digits, maximumFractionDigits: digits }) : String(v));

/** Prints a table of rows (arrays of cells), first row the heading; the columns in `leftCols` are left-aligned. */
export function printTable(rows, leftCols = [0]) {
  const widths = rows[0].map((_, j) => Math.max(...rows.map((r) => String(r[j]).length)));
  const line = (r) => r.map((c, j) => (leftCols.includes(j) ? String(c).padEnd(widths[j]) : String(c).padStart(widths[j]))).join('  ').trimEnd();
  console.log(line(rows[0]));
  console.log(widths.map((w) => '-'.repeat(w)).join('  '));
  for (const r of rows.slice(1)) console.log(line(r));
}

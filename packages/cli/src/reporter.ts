/**
 * What the command tells the user while it runs. Human text goes to stderr; with --json-lines every
 * message is one JSON object per line on stdout ({"event": "start" | "warning" | "progress" |
 * "output" | "done" | "error", ...}). A progress bar is drawn on stderr only when stderr is a terminal
 * and neither --quiet nor --json-lines is given.
 */
import { formatWarning, type Warning } from '@refdelta/core/defaults-and-errors';
import { visible, visibleLine } from './visible-text.js';

export interface ReporterOptions {
  readonly quiet: boolean;
  readonly jsonLines: boolean;
  /** Warnings printed in full before they are only counted (human mode). */
  readonly maxPrintedWarnings?: number;
  /** Warnings kept in memory for summary.json; the rest are only counted (default KEPT_WARNINGS). */
  readonly maxKeptWarnings?: number;
  /** Fields added to every JSON event (e.g. { session: 'rover' } in a batch). */
  readonly context?: Readonly<Record<string, unknown>>;
  /** Put before every human line (e.g. '[rover] '). */
  readonly prefix?: string;
}

/** How many warnings a run keeps for its summary (our choice: enough to diagnose, bounded memory). */
export const KEPT_WARNINGS = 1000;

/** The warnings of a run as summary.json states them: all counted, the first ones kept. */
export interface WarningTally {
  readonly total: number;
  readonly kept: number;
  readonly byCode: Readonly<Record<string, number>>;
}

export class Reporter {
  /** The first maxKeptWarnings warnings (default KEPT_WARNINGS); warningCount counts them all. */
  readonly warnings: Warning[] = [];
  private total = 0;
  private readonly byCode = new Map<string, number>();
  private printed = 0;
  private barShown = false;
  private lastDrawMs = 0;
  private lastJsonProgressMs = 0;
  private readonly startMs = Date.now();
  private readonly tty: boolean;

  constructor(private readonly opts: ReporterOptions) {
    this.tty = Boolean(process.stderr.isTTY) && !opts.quiet && !opts.jsonLines;
  }

  get jsonLinesMode(): boolean {
    return this.opts.jsonLines;
  }

  get quietMode(): boolean {
    return this.opts.quiet;
  }

  /** A reporter for one part of a run (a batch session): same modes, its own warnings, extra event fields and a line prefix. */
  child(context: Readonly<Record<string, unknown>>, prefix: string): Reporter {
    return new Reporter({ ...this.opts, context: { ...this.opts.context, ...context }, prefix: (this.opts.prefix ?? '') + prefix });
  }

  /** All warnings counted, how many are kept in `warnings`, counts by code. */
  get warningTally(): WarningTally {
    return { total: this.total, kept: this.warnings.length, byCode: Object.fromEntries([...this.byCode].sort((a, b) => b[1] - a[1])) };
  }

  /** One JSON line on stdout (json-lines mode only). */
  event(kind: string, fields: Record<string, unknown> = {}): void {
    if (this.opts.jsonLines) process.stdout.write(JSON.stringify({ event: kind, ...this.opts.context, ...fields }) + '\n');
  }

  info(text: string): void {
    if (this.opts.jsonLines || this.opts.quiet) return;
    this.clearBar();
    const p = this.opts.prefix ?? '';
    const body = visible(text.endsWith('\n') ? text.slice(0, -1) : text);
    process.stderr.write(body.split('\n').map((l) => p + l).join('\n') + '\n');
  }

  /** Text on stdout (a command's result table); nothing in --quiet or --json-lines mode. */
  result(text: string): void {
    if (this.opts.jsonLines || this.opts.quiet) return;
    this.clearBar();
    process.stdout.write(visible(text.endsWith('\n') ? text : text + '\n'));
  }

  readonly warn = (w: Warning): void => {
    this.total++;
    this.byCode.set(w.code, (this.byCode.get(w.code) ?? 0) + 1);
    if (this.warnings.length < (this.opts.maxKeptWarnings ?? KEPT_WARNINGS)) this.warnings.push(w);
    if (this.opts.jsonLines) {
      this.event('warning', { file: w.file ?? null, line: w.line ?? null, code: w.code, message: w.message });
      return;
    }
    if (this.opts.quiet) return;
    const max = this.opts.maxPrintedWarnings ?? 20;
    if (this.printed < max) {
      this.clearBar();
      process.stderr.write(`${this.opts.prefix ?? ''}warning: ${visibleLine(formatWarning(w))}\n`);
    }
    this.printed++;
  };

  /** Prints how many warnings were not shown. */
  warningTail(where: string): void {
    const max = this.opts.maxPrintedWarnings ?? 20;
    if (this.printed > max) this.info(`(${this.printed - max} more warnings: see ${where})`);
  }

  /** Epoch progress; fraction in [0, 1] when the span is known. */
  progress(epochsDone: number, fraction: number | null): void {
    const now = Date.now();
    const rate = epochsDone / Math.max((now - this.startMs) / 1000, 1e-3);
    if (this.opts.jsonLines) {
      if (now - this.lastJsonProgressMs < 2000) return;
      this.lastJsonProgressMs = now;
      this.event('progress', { epochs: epochsDone, fraction: fraction === null ? null : Math.round(fraction * 1000) / 1000, epochs_per_s: Math.round(rate) });
      return;
    }
    // Short runs get no bar: it appears once a run has taken a second.
    if (!this.tty || now - this.startMs < 1000 || now - this.lastDrawMs < 200) return;
    this.lastDrawMs = now;
    const width = 30;
    const f = fraction === null ? null : Math.min(Math.max(fraction, 0), 1);
    const bar = f === null ? '' : `[${'#'.repeat(Math.round(f * width)).padEnd(width, '.')}] ${(f * 100).toFixed(0).padStart(3)}% `;
    process.stderr.write(`\r${bar}${epochsDone} epochs, ${rate.toFixed(0)} epochs/s `);
    this.barShown = true;
  }

  clearBar(): void {
    if (this.barShown) {
      process.stderr.write('\r\x1b[2K');
      this.barShown = false;
    }
  }

  /** A failure of one part of a run that goes on (a batch session): 'refdelta: ...' on stderr in every mode. */
  problem(sentence: string): void {
    this.clearBar();
    process.stderr.write(`refdelta: ${visibleLine(sentence)}\n`);
  }

  /** The one sentence of a failure: always printed (also with --quiet), as JSON with --json-lines. */
  failure(sentence: string, exitCode: number, stack?: string): void {
    this.clearBar();
    if (this.opts.jsonLines) this.event('error', { message: sentence, exit_code: exitCode });
    process.stderr.write(`refdelta: ${visibleLine(sentence)}\n`);
    if (stack) process.stderr.write(`${stack}\n`);
  }
}

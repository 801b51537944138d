/**
 * The `warnings` member of summary.json from a Reporter: every warning counted (total, by code), only
 * the first KEPT_WARNINGS kept in memory, the first 50 listed, and a sentence saying so when some
 * were not kept.
 */
import type { Reporter } from './reporter.js';

const LISTED = 50;

export function warningsSummary(rep: Reporter): Record<string, unknown> {
  const t = rep.warningTally;
  const notKept = t.total - t.kept;
  return {
    total: t.total,
    by_code: t.byCode,
    kept: t.kept,
    not_kept: notKept,
    ...(notKept > 0 ? { note: `only the first ${t.kept} warnings were kept in memory; total and by_code count all ${t.total}` } : {}),
    first: rep.warnings.slice(0, LISTED).map((w) => ({ file: w.file ?? null, line: w.line ?? null, code: w.code, message: w.message })),
  };
}

/** report.html of a run whose files are sealed but not yet renamed: read from their temporary files. */
import { sessionReportHtml } from './commands/report.js';
import type { OutputSet } from './node-io.js';

export async function stagedReportHtml(set: OutputSet, summaryDoc: Record<string, unknown>, title: string): Promise<string> {
  return sessionReportHtml({
    epochs: set.temporaryPathOf('epochs'), residuals: set.temporaryPathOf('residuals'), points: set.temporaryPathOf('points'), summary: summaryDoc,
  }, title);
}

/**
 * report.html of a run whose files are sealed but not yet renamed: read from their temporary files.
 * sky.csv (the reference receiver's satellite directions, which no other output holds) is computed and
 * added to the set first, so a later `refdelta report DIR` draws the same sky plot.
 */
import { join } from 'node:path';
import { sessionReportHtml } from './commands/report.js';
import type { OutputSet } from './node-io.js';
import { referenceSkyCsv } from './reference-sky.js';

export const SKY_FILE_NAME = 'sky.csv';

export async function stagedReportHtml(set: OutputSet, summaryDoc: Record<string, unknown>, outDir: string, title: string): Promise<string> {
  const sky = await referenceSkyCsv(summaryDoc);
  if (sky !== null) await (await set.add('sky', join(outDir, SKY_FILE_NAME), [sky])).seal();
  return sessionReportHtml({
    epochs: set.temporaryPathOf('epochs'), residuals: set.temporaryPathOf('residuals'), points: set.temporaryPathOf('points'),
    sky: set.temporaryPathOf('sky'), summary: summaryDoc,
  }, title);
}

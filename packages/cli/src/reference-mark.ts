/** --ref-coord NAME --marks FILE: the reference coordinate from a control list (core control stage reads the CSV). */
import { readFile } from 'node:fs/promises';
import { decimalYearFromGpsS, parseMarksFile, type FrameEpoch, type Warning } from '@refdelta/core';
import { requireFile } from './node-io.js';
import { epsgLookup } from './epsg-lookup.js';
import type { ReferenceChoice, ResolvedReference } from './reference-choice.js';
import { UsageError } from './usage-error.js';
import { requireKnownFrame } from './frame-check.js';

export async function referenceFromMark(
  choice: Extract<ReferenceChoice, { mode: 'mark' }>,
  roverFirstGpsS: number,
  warn: (w: Warning) => void,
  allowUnknownFrame = false,
): Promise<ResolvedReference> {
  await requireFile(choice.marksFile);
  const text = await readFile(choice.marksFile, 'utf8');
  const marks = parseMarksFile(choice.marksFile, text, warn, epsgLookup);
  const wanted = choice.markName.trim().toLowerCase();
  const mark = marks.find((m) => m.name.trim().toLowerCase() === wanted);
  if (!mark) {
    const some = marks.slice(0, 8).map((m) => m.name).join(', ');
    throw new UsageError(`mark '${choice.markName}' is not in ${choice.marksFile}${some ? ` (it holds ${some}${marks.length > 8 ? ', ...' : ''})` : ' (it holds no marks)'}`);
  }
  const listed = mark.position.frame;
  requireKnownFrame(listed.name, `the frame of ${mark.name} in ${choice.marksFile} (line ${mark.line})`, allowUnknownFrame);
  const notes: string[] = [];
  let name = listed.name;
  if (choice.frameName !== undefined && choice.frameName !== listed.name) {
    if (listed.name !== 'unstated') throw new UsageError(`--ref-frame ${choice.frameName} contradicts the frame ${listed.name} given for ${mark.name} in ${choice.marksFile}`);
    name = choice.frameName;
  }
  let epochYear = listed.epochYear;
  if (!Number.isFinite(epochYear)) {
    epochYear = choice.epochYear ?? Math.round(decimalYearFromGpsS(roverFirstGpsS) * 100) / 100;
    if (choice.epochYear === undefined) notes.push(`the control list gives no epoch for ${mark.name}: the observation epoch ${epochYear.toFixed(2)} is assumed`);
  } else if (choice.epochYear !== undefined && Math.abs(choice.epochYear - epochYear) > 0.005) {
    throw new UsageError(`--ref-epoch ${choice.epochYear} contradicts the epoch ${epochYear} given for ${mark.name} in ${choice.marksFile}`);
  }
  if (name === 'unstated') notes.push(`the control list states no frame for ${mark.name}`);
  for (const n of notes) warn({ file: choice.marksFile, line: mark.line, code: 'reference-mark-assumption', message: n });
  const frame: FrameEpoch = { name, epochYear };
  return {
    position: { ecef: mark.position.ecef, frame },
    source: `mark ${mark.name} of ${choice.marksFile} (line ${mark.line})`,
    note: `reference coordinate: mark ${mark.name} from ${choice.marksFile}${notes.length ? `; ${notes.join('; ')}` : ''}`,
  };
}

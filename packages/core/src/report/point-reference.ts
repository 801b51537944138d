/** Words for the point a position refers to, as written in the reports. */
import type { PointReference } from '../session/index.js';
import type { FrameEpoch } from '../gnss/index.js';
import { frameEpochText } from './format.js';

export function pointReferenceWords(p: PointReference): string {
  return p === 'ground-mark' ? 'ground mark' : 'antenna reference point';
}

/** 'ITRF2014 epoch 2018.76' */
export function frameWords(f: FrameEpoch): string {
  return `${f.name} epoch ${frameEpochText(f.epochYear)}`;
}

// The V8 old generation of the refdelta command is let grow to 1.2 times what the last full collection
// kept alive. V8's own rule (from memory: a factor of up to 4, chosen from collection and allocation
// speeds) let the garbage of a long session pile up to several times the live heap before it was
// collected, so a day at 1 Hz peaked about 50 MB above an hour (bench Part 2: 174 against 123 MB; 139
// against 114 MB with this setting). The live heap of a session is small (about 15 to 25 MB): the extra
// full collections cost little (a simulated day's carrier-phase solve makes 11 instead of 5). V8 reads
// the flag whenever a full collection sets the next limit (from memory: src/heap/heap-controller.cc), so
// it may be set once the process runs.
import { setFlagsFromString } from 'node:v8';

export const HEAP_GROWING_PERCENT = 20;

export function limitHeapGrowth() {
  setFlagsFromString(`--heap-growing-percent=${HEAP_GROWING_PERCENT}`);
}

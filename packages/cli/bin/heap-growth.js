// V8 heap settings of the refdelta command.
//
// Old generation: let grow to 1.2 times what the last full collection kept alive. V8's own rule (from
// memory: a factor of up to 4, chosen from collection and allocation speeds) let the garbage of a long
// session pile up to several times the live heap before it was collected, so a day at 1 Hz peaked about
// 50 MB above an hour (bench Part 2: 174 against 123 MB; 139 against 114 MB with this setting). The live
// heap of a session is small (about 15 to 25 MB): the extra full collections cost little (a simulated
// day's carrier-phase solve makes 11 instead of 5). V8 reads the flag whenever a full collection sets the
// next limit (from memory: src/heap/heap-controller.cc), so it may be set once the process runs.
//
// Young generation: at most YOUNG_SEMI_SPACE_MIB per semi-space (V8's default on 64-bit is 16). Over a
// long run V8 doubles the semi-spaces up to their maximum (each time the bytes that survived scavenges
// since the last doubling exceed their size), and adds the young generation's size to the old
// generation's limit, so a day at 1 Hz peaked about 50 MB above an hour with the same live heap (bench
// Part 5: 154 against 101 MB; 123 against 102 MB with 8 MiB, at the same CPU within run-to-run noise;
// 4 MiB gave 108 against 93 MB at 5-10 % more CPU). V8 reads this setting only when the process starts:
// the command's first line passes it to node (`#!/usr/bin/env -S node --max-semi-space-size=8`), and
// batch workers get it as a resource limit (three semi-spaces' worth: two semi-spaces and the
// large-object space beside them, from memory of V8's young-generation sizing).
import { setFlagsFromString } from 'node:v8';

export const HEAP_GROWING_PERCENT = 20;
export const YOUNG_SEMI_SPACE_MIB = 8;

export function limitHeapGrowth() {
  setFlagsFromString(`--heap-growing-percent=${HEAP_GROWING_PERCENT}`);
}

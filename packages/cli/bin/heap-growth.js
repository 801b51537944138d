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
// Young generation: at most YOUNG_SEMI_SPACE_MIB per semi-space (node 20's V8 default on 64-bit is 16).
// Over a long run V8 doubles the semi-spaces up to their maximum (each time the bytes that survived
// scavenges since the last doubling exceed their size) and adds the young generation's size to the old
// generation's limit, so a day at 1 Hz peaked about 50 MB above an hour with the same live heap (bench
// Part 5: 155 against 99 MB; 122 against 99 MB with 8 MiB, at the same CPU within run-to-run noise; 4 MiB
// gave 108 against 93 MB at 5-10 % more CPU). V8 reads this bound only when an isolate starts, so the
// command runs itself again with it (runWithYoungGenerationBound) unless node was started with flags of
// its own, and batch workers get it as a resource limit (batch-workers.ts: three semi-spaces' worth, two
// semi-spaces and the large-object space beside them, from memory of V8's young-generation sizing).
import { spawn } from 'node:child_process';
import { setFlagsFromString } from 'node:v8';

export const HEAP_GROWING_PERCENT = 20;
export const YOUNG_SEMI_SPACE_MIB = 8;
export const YOUNG_SEMI_SPACE_FLAG = `--max-semi-space-size=${YOUNG_SEMI_SPACE_MIB}`;

export function limitHeapGrowth() {
  setFlagsFromString(`--heap-growing-percent=${HEAP_GROWING_PERCENT}`);
}

/** Commands that end at once: not worth a second process. */
const SHORT = new Set(['--version', '--help', '-h', 'help']);

/**
 * Whether this process should run the command in a child node started with the young-generation bound:
 * not when node was given flags of its own (the caller's choice: --inspect, a bound of its own...), nor
 * when NODE_OPTIONS sets the semi-space size, nor for a command that ends at once (no arguments,
 * --version, --help).
 */
export function needsBoundedChild(execArgv, nodeOptions, args) {
  if (execArgv.length > 0) return false;
  if (/--max-semi-space-size/.test(nodeOptions ?? '')) return false;
  return args.length > 0 && !args.some((a) => SHORT.has(a));
}

/**
 * Runs this script again in a child node with the young-generation bound, its standard streams the
 * parent's, and ends this process as the child ended (its exit code, or the signal that stopped it).
 * Signals sent to this process alone (a kill from another program) are passed on; Ctrl-C reaches both
 * (the terminal signals the whole process group), and this process waits for the child's end.
 */
export function runWithYoungGenerationBound(script, args) {
  const child = spawn(process.execPath, [YOUNG_SEMI_SPACE_FLAG, script, ...args], { stdio: 'inherit' });
  const forward = (signal) => { child.kill(signal); };
  for (const s of ['SIGINT', 'SIGTERM', 'SIGHUP']) process.on(s, forward);
  child.on('error', (e) => {
    process.stderr.write(`refdelta: could not start node (${process.execPath}): ${e.message}\n`);
    process.exit(1);
  });
  child.on('exit', (code, signal) => {
    for (const s of ['SIGINT', 'SIGTERM', 'SIGHUP']) process.off(s, forward);
    if (signal) process.kill(process.pid, signal);
    else process.exit(code ?? 1);
  });
}

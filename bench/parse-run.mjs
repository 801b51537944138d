// One process's part-1 measurement (bench/parse-throughput.mjs), sent back to bench/run.mjs over IPC.
// Part 1 runs in several fresh processes because V8's decisions while it optimises the reader (which
// allocation sites it pretenures, for one) differ from process to process and change the reader's time
// by up to about 3x on the same bytes; one process's median would hide that.
import { loadCore } from './load-core.mjs';
import { benchParse } from './parse-throughput.mjs';

const core = await loadCore();
const results = await benchParse(core, process.argv[2]);
process.send(results, () => process.exit(0));

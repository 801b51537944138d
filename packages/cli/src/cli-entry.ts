/**
 * The command's entry: runs refdelta on the process's arguments. The bundle (scripts/bundle.mjs) starts
 * here; importing main.ts alone (the library entry) runs nothing.
 */
import { runFromProcess } from './main.js';

await runFromProcess();

#!/usr/bin/env node
// The refdelta command: runs the built CLI as one bundled file (npm install builds it; see the root
// package.json "build"), which starts about twice as fast as loading its modules one by one. A command
// that works on files runs in a child node whose young generation is bounded (heap-growth.js), so that
// a long session's peak memory stays near a short one's.
import { fileURLToPath } from 'node:url';
import { limitHeapGrowth, needsBoundedChild, runWithYoungGenerationBound } from './heap-growth.js';

const args = process.argv.slice(2);
if (needsBoundedChild(process.execArgv, process.env.NODE_OPTIONS, args)) {
  runWithYoungGenerationBound(fileURLToPath(import.meta.url), args);
} else {
  limitHeapGrowth();
  await import('../dist/refdelta.mjs');
}

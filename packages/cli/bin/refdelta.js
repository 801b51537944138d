#!/usr/bin/env -S node --max-semi-space-size=8
// The refdelta command: runs the built CLI as one bundled file (npm install builds it; see the root
// package.json "build"), which starts about twice as fast as loading its modules one by one. The first
// line bounds V8's young generation (heap-growth.js: YOUNG_SEMI_SPACE_MIB, which must match it); run as
// `node bin/refdelta.js` the command works the same with V8's default young generation.
import { limitHeapGrowth } from './heap-growth.js';

limitHeapGrowth();
await import('../dist/refdelta.mjs');

#!/usr/bin/env node
// The refdelta command: runs the built CLI as one bundled file (npm install builds it; see the root
// package.json "build"), which starts about twice as fast as loading its modules one by one.
import { limitHeapGrowth } from './heap-growth.js';

limitHeapGrowth();
await import('../dist/refdelta.mjs');

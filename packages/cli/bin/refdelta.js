#!/usr/bin/env node
// The refdelta command: runs the built CLI (npm install builds it; see the root package.json "prepare").
import { runFromProcess } from "../dist/main.js";

await runFromProcess();

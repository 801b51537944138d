#!/usr/bin/env node
// The refdelta command: runs the built CLI (npm install builds it; see the root package.json "prepare").
import "../dist/main.js";

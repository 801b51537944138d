/** Name and version written into the outputs: the version is the CLI package's own (package.json). */
import { readFileSync } from 'node:fs';

/**
 * The CLI package's version, from its package.json: one folder up from dist/ (the modules and the bundle)
 * or two from dist/chunks/ (a chunk of the bundle holding this module).
 */
function packageVersion(): string {
  for (const rel of ['../package.json', '../../package.json']) {
    try {
      const pkg = JSON.parse(readFileSync(new URL(rel, import.meta.url), 'utf8')) as { name?: string; version?: string };
      if (pkg.name === '@refdelta/cli') return pkg.version ?? 'unknown';
    } catch {
      // not this folder
    }
  }
  return 'unknown';
}

export const SOFTWARE = { name: 'refdelta', version: packageVersion() } as const;

/** Name and version written into the outputs: the version is the CLI package's own (package.json). */
import { readFileSync } from 'node:fs';

function packageVersion(): string {
  try {
    const pkg = JSON.parse(readFileSync(new URL('../package.json', import.meta.url), 'utf8')) as { version?: string };
    return pkg.version ?? 'unknown';
  } catch {
    return 'unknown';
  }
}

export const SOFTWARE = { name: 'refdelta', version: packageVersion() } as const;

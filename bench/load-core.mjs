// The BUILT engine library (packages/core/dist): its public index plus the simulator's index.
import { resolve, dirname } from 'node:path';
import { fileURLToPath, pathToFileURL } from 'node:url';

export const ROOT = resolve(dirname(fileURLToPath(import.meta.url)), '..');

export async function loadCore(dist = resolve(ROOT, 'packages/core/dist')) {
  const core = await import(pathToFileURL(resolve(dist, 'index.js')).href);
  const sim = await import(pathToFileURL(resolve(dist, 'sim/index.js')).href);
  return { ...core, ...sim };
}

// The BUILT engine library (packages/core/dist): its public index plus the simulator's (packages/sim/dist).
import { resolve, dirname } from 'node:path';
import { fileURLToPath, pathToFileURL } from 'node:url';

export const ROOT = resolve(dirname(fileURLToPath(import.meta.url)), '..');

export async function loadCore(dist = resolve(ROOT, 'packages/core/dist')) {
  const core = await import(pathToFileURL(resolve(dist, 'index.js')).href);
  // The simulator is a workspace package of its own (packages/sim), built beside the engine.
  const sim = await import(pathToFileURL(resolve(ROOT, 'packages/sim/dist/index.js')).href);
  return { ...core, ...sim };
}

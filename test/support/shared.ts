/**
 * Test support: where the real datasets beside the project live, and a one-line skip reason when they
 * are absent. Tests that need ../shared use `describeShared` so they are skipped, never silently passed.
 */
import { existsSync, createReadStream, readFileSync } from 'node:fs';
import { dirname, resolve } from 'node:path';
import { fileURLToPath } from 'node:url';
import { describe } from 'vitest';

export const REPO_ROOT = resolve(dirname(fileURLToPath(import.meta.url)), '..', '..');
export const SHARED_DIR = resolve(REPO_ROOT, '..', 'shared');
export const DATA_DIR = resolve(SHARED_DIR, 'data');
export const HAS_SHARED = existsSync(resolve(DATA_DIR, 'README.md'));
export const SHARED_SKIP_REASON = `../shared/data not found beside the project (${SHARED_DIR}): real-data tests skipped`;

/** Absolute path of a file under ../shared/data. */
export function dataPath(rel: string): string {
  if (rel.includes('walking-run')) throw new Error('the walking-run folder is reserved for acceptance and must not be read by tests');
  return resolve(DATA_DIR, rel);
}

export function sharedPath(rel: string): string {
  return resolve(SHARED_DIR, rel);
}

export function fixturePath(rel: string): string {
  return resolve(REPO_ROOT, 'fixtures', rel);
}

/** describe() that is skipped with a printed one-line reason when ../shared is missing. */
export function describeShared(name: string, fn: () => void): void {
  if (!HAS_SHARED) {
    // eslint-disable-next-line no-console
    console.warn(`[skip] ${name}: ${SHARED_SKIP_REASON}`);
    describe.skip(name, fn);
  } else {
    describe(name, fn);
  }
}

/** The file's bytes as an async iterable of chunks (what the core readers take). */
export async function* fileChunks(path: string, chunkBytes = 1 << 16): AsyncIterable<Uint8Array> {
  for await (const c of createReadStream(path, { highWaterMark: chunkBytes })) yield c as Uint8Array;
}

export function fileBytes(path: string): Uint8Array {
  return new Uint8Array(readFileSync(path));
}

/** Async iterable over one in-memory chunk. */
export async function* once<T>(x: T): AsyncIterable<T> {
  yield x;
}

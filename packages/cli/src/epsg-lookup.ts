/**
 * EPSG definitions for the core's projections and .prj files, read from the npm package epsg-index
 * (the EPSG dataset as PROJ exports it: one JSON file per code with name, kind, PROJ string and WKT 1).
 * Files are read on demand and kept; a code the dataset lacks is undefined.
 */
import { readFileSync } from 'node:fs';
import { createRequire } from 'node:module';
import { dirname, join } from 'node:path';
import type { AreaOfUse, EpsgDefinition, EpsgLookup } from '@refdelta/core';

const cache = new Map<number, EpsgDefinition | undefined>();
let folder: string | undefined;

function definitionsFolder(): string {
  folder ??= join(dirname(createRequire(import.meta.url).resolve('epsg-index/package.json')), 's');
  return folder;
}

/** One code's file in epsg-index: `bbox` is the area of use as [north, west, south, east] degrees, `area` its words. */
interface EpsgIndexEntry { code: string; name: string; kind: string; proj4: string | null; wkt: string | null; bbox?: unknown; area?: unknown }

function areaOfUseOf(j: EpsgIndexEntry): AreaOfUse | null {
  const b = j.bbox;
  if (!Array.isArray(b) || b.length !== 4 || !b.every((v) => typeof v === 'number' && Number.isFinite(v))) return null;
  const [northDeg, westDeg, southDeg, eastDeg] = b as number[];
  return { northDeg: northDeg!, westDeg: westDeg!, southDeg: southDeg!, eastDeg: eastDeg!, description: typeof j.area === 'string' ? j.area : '' };
}

export const epsgLookup: EpsgLookup = (code) => {
  if (!Number.isInteger(code) || code <= 0) return undefined;
  if (cache.has(code)) return cache.get(code);
  let d: EpsgDefinition | undefined;
  try {
    const j = JSON.parse(readFileSync(join(definitionsFolder(), `${code}.json`), 'utf8')) as EpsgIndexEntry;
    d = { code, name: j.name, kind: j.kind, proj4: j.proj4 ?? '', wkt: j.wkt, areaOfUse: areaOfUseOf(j) };
  } catch {
    d = undefined;
  }
  cache.set(code, d);
  return d;
};

/** OGC WKT 1 of an EPSG code (what a .prj holds), or null. */
export function epsgWkt(code: number | null): string | null {
  return code === null ? null : epsgLookup(code)?.wkt ?? null;
}

/**
 * Finds a chain of one or two Helmert transformations from one frame to another among the configured
 * parameter sets (each usable forwards or inverted), and applies it at the coordinate's epoch.
 * Two hops cover e.g. ITRF2020 -> ITRF2014 -> ETRF2000. Longer chains are refused: each hop adds its
 * own parameter uncertainty, and a user needing one should supply a direct set.
 */
import type { FramedEcef } from '../gnss/index.js';
import { ProcessingError } from '../errors.js';
import { applyHelmert, invertHelmert, type HelmertParams } from './helmert.js';
import { normaliseFrameName } from './frame-names.js';

export interface TransformPath {
  readonly from: string;
  readonly to: string;
  /** Empty when from and to are the same frame. */
  readonly steps: readonly HelmertParams[];
}

/** Every set in both directions. */
function directedSets(sets: readonly HelmertParams[]): HelmertParams[] {
  const out: HelmertParams[] = [];
  for (const s of sets) {
    const n = { ...s, from: normaliseFrameName(s.from), to: normaliseFrameName(s.to) };
    out.push(n, invertHelmert(n));
  }
  return out;
}

/** The shortest path (0, 1 or 2 steps) or undefined. Prefers a direct set over a two-hop chain. */
export function findTransformPath(fromName: string, toName: string, sets: readonly HelmertParams[]): TransformPath | undefined {
  const from = normaliseFrameName(fromName);
  const to = normaliseFrameName(toName);
  if (from === to) return { from, to, steps: [] };
  const d = directedSets(sets);
  // Forward (as published) sets come before their inverses in `d`, so a published direction wins.
  const direct = d.find((s) => s.from === from && s.to === to);
  if (direct) return { from, to, steps: [direct] };
  for (const a of d) {
    if (a.from !== from) continue;
    const b = d.find((s) => s.from === a.to && s.to === to);
    if (b) return { from, to, steps: [a, b] };
  }
  return undefined;
}

/** Transforms a framed coordinate to `toName` at its own epoch; throws ProcessingError when no path exists. */
export function transformToFrame(p: FramedEcef, toName: string, sets: readonly HelmertParams[]): FramedEcef {
  const path = findTransformPath(p.frame.name, toName, sets);
  if (!path) {
    throw new ProcessingError(
      `no transformation configured from ${normaliseFrameName(p.frame.name)} to ${normaliseFrameName(toName)}: ` +
        'supply a parameter set (JSON file with from, to, epoch, t_mm, d_ppb, r_mas and rates) linking them directly or via one shared frame',
    );
  }
  if (path.steps.length > 0 && !Number.isFinite(p.frame.epochYear)) {
    throw new ProcessingError(
      `cannot transform from ${path.from} to ${path.to} without the coordinate's epoch: the parameters change with time; give the epoch (decimal year)`,
    );
  }
  let ecef = p.ecef;
  for (const s of path.steps) ecef = applyHelmert(ecef, p.frame.epochYear, s);
  return { ecef, frame: { name: path.to, epochYear: p.frame.epochYear } };
}

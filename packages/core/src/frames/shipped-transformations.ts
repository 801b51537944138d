/**
 * The shipped transformation parameter sets (parameter-sets.ts) by name, for a user who picks one on
 * the command line: 'ITRF2014>ETRF2000' (either direction: a set is used forwards or inverted, and one
 * intermediate frame may be chained, frame-path.ts). The WGS 84 identity is selectable by its name
 * 'WGS84=ITRF2014' only, never implied.
 */
import type { HelmertParams } from './helmert.js';
import { normaliseFrameName } from './frame-names.js';
import { DEFAULT_HELMERT_SETS, WGS84_AS_ITRF2014 } from './parameter-sets.js';

export interface ShippedTransformation {
  readonly name: string;
  readonly params: HelmertParams;
}

export const SHIPPED_TRANSFORMATIONS: readonly ShippedTransformation[] = [
  ...DEFAULT_HELMERT_SETS.map((p) => ({ name: `${p.from}>${p.to}`, params: p })),
  { name: 'WGS84=ITRF2014', params: WGS84_AS_ITRF2014 },
];

/** True when the text has the form of a transformation name (FRAME>FRAME or FRAME=FRAME). */
export function looksLikeTransformationName(text: string): boolean {
  return /^[^\s>=/\\]+\s*[>=]\s*[^\s>=/\\]+$/.test(text.trim()) && !/\.json$/i.test(text.trim());
}

/**
 * The shipped set(s) named: 'A>B' is any one set between A and B in either direction; 'WGS84=ITRF2014'
 * the identity. A RangeError listing the names when none matches.
 */
export function shippedTransformation(name: string): HelmertParams {
  const t = name.trim();
  const eq = /^(.+?)\s*=\s*(.+)$/.exec(t);
  if (eq && normaliseFrameName(eq[1]) === 'WGS84' && normaliseFrameName(eq[2]) === 'ITRF2014') return WGS84_AS_ITRF2014;
  const m = /^(.+?)\s*>\s*(.+)$/.exec(t);
  if (m) {
    const a = normaliseFrameName(m[1]), b = normaliseFrameName(m[2]);
    const hit = DEFAULT_HELMERT_SETS.find((p) => (normaliseFrameName(p.from) === a && normaliseFrameName(p.to) === b) || (normaliseFrameName(p.from) === b && normaliseFrameName(p.to) === a));
    if (hit) return hit;
  }
  throw new RangeError(`'${name}' is not a shipped transformation: give one of ${SHIPPED_TRANSFORMATIONS.map((s) => s.name).join(', ')} (either direction), or a parameter JSON file`);
}

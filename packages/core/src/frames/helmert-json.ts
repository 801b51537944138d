/**
 * Our own user file format for transformation parameter sets (JSON). One object, or an array of them:
 *
 *   { "from": "ITRF2014", "to": "ETRF2000", "epoch": 2010.0,
 *     "t_mm": [54.7, 52.2, -74.1], "d_ppb": 2.12, "r_mas": [1.701, 10.29, -16.632],
 *     "tdot_mm_per_yr": [0.1, 0.1, -1.9], "ddot_ppb_per_yr": 0.11, "rdot_mas_per_yr": [0.081, 0.49, -0.792],
 *     "source": "where the numbers come from" }
 *
 * Rates may be omitted (taken as zero); everything else is required. Sign convention: IERS
 * Conventions 2010 eq. 4.13 (X2 = X1 + T + D X1 + R X1), see helmert.ts. Errors are InputError naming
 * the file, the line of the field when it can be found, and the field.
 */
import { InputError } from '../errors.js';
import type { HelmertParams, Vec3 } from './helmert.js';
import { normaliseFrameName } from './frame-names.js';

/** 1-based line of character offset `pos` in `text`. */
function lineOfOffset(text: string, pos: number): number {
  let line = 1;
  for (let i = 0; i < pos && i < text.length; i++) if (text.charCodeAt(i) === 10) line++;
  return line;
}

/** Line of the n-th (0-based) occurrence of `"key"` in the text, or 0. */
function lineOfKey(text: string, key: string, occurrence: number): number {
  let from = 0;
  for (let k = 0; ; k++) {
    const i = text.indexOf(`"${key}"`, from);
    if (i < 0) return 0;
    if (k === occurrence) return lineOfOffset(text, i);
    from = i + 1;
  }
}

export function parseHelmertJson(file: string, text: string): HelmertParams[] {
  let doc: unknown;
  try {
    doc = JSON.parse(text);
  } catch (e) {
    const msg = e instanceof Error ? e.message : String(e);
    const m = /position (\d+)/.exec(msg);
    const line = m ? lineOfOffset(text, Number(m[1])) : 0;
    throw new InputError(file, line, `expected a JSON transformation parameter set (${msg})`);
  }
  const items = Array.isArray(doc) ? doc : [doc];
  return items.map((item, idx) => parseOne(file, text, item, idx));
}

function parseOne(file: string, text: string, item: unknown, idx: number): HelmertParams {
  if (typeof item !== 'object' || item === null || Array.isArray(item)) {
    throw new InputError(file, 0, `entry ${idx + 1}: expected an object with from, to, epoch, t_mm, d_ppb, r_mas`);
  }
  const o = item as Record<string, unknown>;
  const fail = (key: string, what: string): never => {
    throw new InputError(file, lineOfKey(text, key, idx), `field "${key}" (entry ${idx + 1}): expected ${what}`);
  };
  const str = (key: string): string => {
    const v = o[key];
    if (typeof v !== 'string' || v.trim() === '') fail(key, 'a non-empty string');
    return (v as string).trim();
  };
  const num = (key: string, optional: boolean): number => {
    const v = o[key];
    if (v === undefined && optional) return 0;
    if (typeof v !== 'number' || !Number.isFinite(v)) fail(key, 'a finite number');
    return v as number;
  };
  const vec = (key: string, optional: boolean): Vec3 => {
    const v = o[key];
    if (v === undefined && optional) return [0, 0, 0];
    if (!Array.isArray(v) || v.length !== 3 || !v.every((x) => typeof x === 'number' && Number.isFinite(x))) {
      fail(key, 'an array of three finite numbers');
    }
    const a = v as number[];
    return [a[0]!, a[1]!, a[2]!];
  };
  const epoch = num('epoch', false);
  if (epoch < 1980 || epoch > 2100) fail('epoch', 'a decimal year between 1980 and 2100');
  return {
    from: normaliseFrameName(str('from')),
    to: normaliseFrameName(str('to')),
    epochYear: epoch,
    tMm: vec('t_mm', false),
    dPpb: num('d_ppb', false),
    rMas: vec('r_mas', false),
    tdotMmPerYr: vec('tdot_mm_per_yr', true),
    ddotPpbPerYr: num('ddot_ppb_per_yr', true),
    rdotMasPerYr: vec('rdot_mas_per_yr', true),
    source: str('source'),
  };
}

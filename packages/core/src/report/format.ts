/** Cell formatting shared by the report builders: fixed decimals, empty cell for "no value". */

/** Fixed-decimal text of a number; '' for null, undefined, NaN or infinities (an empty CSV cell means "no value"). */
export function fixed(x: number | null | undefined, decimals: number): string {
  if (x === null || x === undefined || !Number.isFinite(x)) return '';
  const t = x.toFixed(decimals);
  // '-0.000' reads as a sign where there is none.
  return t.charCodeAt(0) === 45 && onlyZeros(t, 1) ? t.slice(1) : t;
}

/** True when t from index `from` holds nothing but '0' and '.' (a negative number that rounded to zero). */
function onlyZeros(t: string, from: number): boolean {
  for (let i = from; i < t.length; i++) {
    const c = t.charCodeAt(i);
    if (c !== 48 && c !== 46) return false;
  }
  return true;
}

/** A number kept for JSON output: null for NaN/infinities (JSON has no NaN), rounded to `decimals`. */
export function jsonNumber(x: number | null | undefined, decimals: number): number | null {
  if (x === null || x === undefined || !Number.isFinite(x)) return null;
  const k = 10 ** decimals;
  const r = Math.round(x * k) / k;
  return Object.is(r, -0) ? 0 : r;
}

/** A frame epoch as decimal-year text, as given (up to 4 decimals, about an hour), e.g. 2018.76 or 2024.3672. */
export function frameEpochText(epochYear: number): string {
  return Number.isFinite(epochYear) ? String(Math.round(epochYear * 1e4) / 1e4) : 'unstated';
}

/** Cell formatting shared by the report builders: fixed decimals, empty cell for "no value". */

/** Fixed-decimal text of a number; '' for null, undefined, NaN or infinities (an empty CSV cell means "no value"). */
export function fixed(x: number | null | undefined, decimals: number): string {
  if (x === null || x === undefined || !Number.isFinite(x)) return '';
  const quick = fixedAwayFromTies(x, decimals);
  if (quick !== null) return quick;
  const t = x.toFixed(decimals);
  // '-0.000' reads as a sign where there is none.
  return t.charCodeAt(0) === 45 && onlyZeros(t, 1) ? t.slice(1) : t;
}

const POW10 = [1, 10, 100, 1e3, 1e4, 1e5, 1e6, 1e7, 1e8, 1e9];
const ZEROS = ['', '0', '00', '000', '0000', '00000', '000000', '0000000', '00000000', '000000000'];

/**
 * The text of fixed() by integer arithmetic, which the output builders call for every cell (several
 * times faster than toFixed), or null near a rounding tie, where toFixed decides. toFixed rounds the
 * exact value x * 10^d to an integer (ECMA-262, Number.prototype.toFixed); the product in doubles is
 * within |x * 10^d| * 2^-53 of it, so away from a tie (by more than 1e-15 relative) both round to the
 * same integer. The sign of a number that rounds to zero is dropped, as fixed() does.
 * The integer n is written as its whole part n / 10^d and its fraction n mod 10^d: two small integers
 * convert to text faster than one above 2^31. floor(n / 10^d) is exact: for n < 2^52 the quotient is
 * at least 1 / (n + 10^d) short of the next integer, more than its rounding error of 2^-53 relative.
 */
function fixedAwayFromTies(x: number, decimals: number): string | null {
  if (!(decimals >= 0 && decimals <= 9) || decimals !== Math.floor(decimals)) return null;
  const scale = POW10[decimals];
  const scaled = x * scale;
  const a = Math.abs(scaled);
  if (!(a < 2 ** 52)) return null;
  if (Math.abs(a - Math.floor(a) - 0.5) <= a * 1e-15) return null;
  const n = Math.round(a);
  const sign = x < 0 && n !== 0 ? '-' : '';
  if (decimals === 0) return sign + String(n);
  const whole = Math.floor(n / scale);
  const fraction = String(n - whole * scale);
  return sign + String(whole) + '.' + ZEROS[decimals - fraction.length] + fraction;
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

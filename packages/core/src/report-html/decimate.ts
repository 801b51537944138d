/**
 * Decimation of what is drawn (never of what is computed): every k-th entry, k the smallest stride that
 * keeps at most `maxMarks` entries. Deterministic, so a reader can predict the marks on a chart:
 * entries 0, k, 2k, ... (ceil(n / k) of them).
 */
export function decimationStride(n: number, maxMarks: number): number {
  return n <= maxMarks ? 1 : Math.ceil(n / maxMarks);
}

/** Indices kept, among those passing `keep`, with stride over all entries (so the time base stays regular). */
export function decimatedIndices(n: number, stride: number, keep: (i: number) => boolean = () => true): number[] {
  const out: number[] = [];
  for (let i = 0; i < n; i += stride) if (keep(i)) out.push(i);
  return out;
}

/** English ordinal of a stride: 2nd, 3rd, 11th, 22nd. */
export function ordinal(k: number): string {
  const tens = k % 100, ones = k % 10;
  const suffix = tens >= 11 && tens <= 13 ? 'th' : ones === 1 ? 'st' : ones === 2 ? 'nd' : ones === 3 ? 'rd' : 'th';
  return `${k}${suffix}`;
}

/** A sentence for the chart: what was drawn of how many. */
export function decimationNote(drawn: number, total: number, stride: number, what: string): string {
  return stride === 1
    ? `All ${total.toLocaleString('en-US')} ${what} drawn`
    : `Drawn: every ${ordinal(stride)} of ${total.toLocaleString('en-US')} ${what} (${drawn.toLocaleString('en-US')} marks); statistics and tables use all of them`;
}

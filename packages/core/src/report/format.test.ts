/** fixed() against ECMAScript's Number.prototype.toFixed (the reference: ECMA-262), ties and signs included. */
import { describe, expect, it } from 'vitest';
import { fixed } from './format.js';

/** The reference: toFixed, with the sign of a number that rounds to zero dropped. */
function reference(x: number, d: number): string {
  const t = x.toFixed(d);
  return /^-[0.]+$/.test(t) ? t.slice(1) : t;
}

describe('fixed (against Number.prototype.toFixed)', () => {
  it('gives toFixed\'s text for random values of every magnitude, 0 to 9 decimals', () => {
    let seed = 12345;
    const rnd = (): number => { seed = (seed * 1103515245 + 12345) % 2147483648; return seed / 2147483648; };
    for (let i = 0; i < 200_000; i++) {
      const x = (rnd() - 0.5) * 10 ** Math.floor(rnd() * 16 - 6);
      const d = Math.floor(rnd() * 10);
      expect(fixed(x, d)).toBe(reference(x, d));
    }
  });

  it('gives toFixed\'s text at and near rounding ties and for signed zeros', () => {
    const xs = [0.5, 1.5, 2.5, -0.5, -2.5, 0.125, 0.375, -0.125, 1.005, 2.675, 1.45, -1.45, 0.0005, -0.00005, -0, 0, 1e-12, -1e-12,
      123456.78905, 4096.00005, 0.30000000000000004, 9.995, 99.995, -99.995, 1e15, -1e15, 4.35, 8.345];
    for (const x of xs) for (let d = 0; d <= 9; d++) expect(fixed(x, d)).toBe(reference(x, d));
    expect(fixed(NaN, 3)).toBe('');
    expect(fixed(Infinity, 3)).toBe('');
  });
});

/** Formula injection defence (OWASP "CSV Injection", common practice): a leading apostrophe, numbers untouched. */
import { describe, expect, it } from 'vitest';
import { inertCell } from './inert-cell.js';

describe('inertCell', () => {
  it('prefixes cells a spreadsheet would run as formulas', () => {
    for (const c of ['=HYPERLINK("http://x","y")', '+1+cmd', '-2+3', '@SUM(A1)', '\t=1', '\r=1', '=', '-', '+ab']) {
      expect(inertCell(c)).toBe(`'${c}`);
    }
  });
  it('leaves numbers and ordinary text alone', () => {
    for (const c of ['-12.5', '+3', '-1.2e-5', '0.5', '-.5', 'MILLSTONE', '', 'a=b', "'=x"]) expect(inertCell(c)).toBe(c);
  });
});

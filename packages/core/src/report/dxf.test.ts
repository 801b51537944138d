import { describe, expect, it } from 'vitest';
import { dxfMtextValue, pointsDxf } from './dxf.js';

describe('DXF point names as ASCII MTEXT values', () => {
  it('characters outside ASCII as \\U+XXXX (four upper-case hex digits), ASCII as it is', () => {
    expect(dxfMtextValue('Ráth Éile')).toBe('R\\U+00E1th \\U+00C9ile');
    expect(dxfMtextValue('Łódź')).toBe('\\U+0141\\U+00F3d\\U+017A');
    expect(dxfMtextValue('P-12 north')).toBe('P-12 north');
  });
  it('MTEXT format characters escaped, a caret as caret-space, control characters as spaces, beyond the BMP as U+FFFD', () => {
    expect(dxfMtextValue('a\\b {c}')).toBe('a\\\\b \\{c\\}');
    expect(dxfMtextValue('x^y')).toBe('x^ y');
    expect(dxfMtextValue('one\ntwo\u0085')).toBe('one two ');
    expect(dxfMtextValue('\u{1F600}')).toBe('\\U+FFFD');
  });
  it("two percent signs (the %%d, %%c, %%p codes): the second and each one after as \\U+0025, a lone one as it is", () => {
    expect(dxfMtextValue('10%%d')).toBe('10%\\U+0025d');
    expect(dxfMtextValue('%%%c 50%')).toBe('%\\U+0025\\U+0025c 50%');
  });
  it('cut at a whole character to fit one group 1 line (250 characters)', () => {
    const v = dxfMtextValue('é'.repeat(100));
    expect(v.length).toBeLessThanOrEqual(250);
    expect(v).toBe('\\U+00E9'.repeat(35));
  });
  it('the file is ASCII, states its code page, and starts with its comment lines', () => {
    const text = pointsDxf([{ name: 'Zürich', eastingM: 483413, northingM: 5219757, heightM: 410 }], ['grid: ETRS89 / UTM zone 32N', 'höhe']);
    expect(/^[\x00-\x7f]*$/.test(text)).toBe(true);
    expect(text.startsWith('999\ngrid: ETRS89 / UTM zone 32N\n999\nh?he\n0\nSECTION\n')).toBe(true);
    expect(text).toContain('$DWGCODEPAGE\n3\nANSI_1252\n');
    expect(text).toMatch(/\nMTEXT\n[\s\S]*\n1\nZ\\U\+00FCrich\n/);
  });
});

/**
 * The committed demo (fixtures/demo/) is exactly what the seed produces: SELF-CONSISTENCY test (the
 * generator is ours). Regenerate with `npm run build && node fixtures/demo/make-demo.mjs` after a deliberate change.
 */
import { createHash } from 'node:crypto';
import { existsSync, readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { DEMO_FILE_NAMES, renderDemoFiles } from '../packages/sim/src/index.js';
import { fixturePath } from './support/shared.js';

function sha256(chunks: Iterable<string>): string {
  const h = createHash('sha256');
  for (const c of chunks) h.update(c, 'utf8');
  return h.digest('hex');
}

describe('demo data (self-consistency): regeneration from the seed is byte-for-byte identical', () => {
  const files = renderDemoFiles();

  it('renders every listed file', () => {
    expect(files.map((f) => f.name)).toEqual([...DEMO_FILE_NAMES]);
  });

  it('each committed file has the SHA-256 of an in-memory generation', () => {
    for (const f of files) {
      const path = fixturePath(`demo/${f.name}`);
      expect(existsSync(path), `${path} missing: run node fixtures/demo/make-demo.mjs`).toBe(true);
      const committed = createHash('sha256').update(readFileSync(path)).digest('hex');
      expect(sha256(f.chunks()), `${f.name} differs from its regeneration`).toBe(committed);
    }
  });

  it('the control-marks file publishes WELLHEAD 3 cm north of its true mark and the others true', () => {
    const rows = readFileSync(fixturePath('demo/control-marks.csv'), 'utf8').split('\n').filter((l) => l && !l.startsWith('#'));
    const points = readFileSync(fixturePath('demo/points.csv'), 'utf8').split('\n').filter((l) => l && !l.startsWith('#'));
    const truth = new Map(points.slice(1).map((l) => { const c = l.split(','); return [c[0]!, Number(c[5])]; }));
    const marks = new Map(rows.slice(1).map((l) => { const c = l.split(','); return [c[0]!, Number(c[1])]; }));
    // 1 deg of latitude is about 111.2 km near 47 N (spherical approximation, common practice): 3 cm = 2.7e-7 deg.
    expect((marks.get('WELLHEAD')! - truth.get('WELLHEAD')!) * 111_200).toBeCloseTo(0.03, 3);
    expect(marks.get('MILLSTONE')).toBe(truth.get('MILLSTONE'));
    expect(marks.get('ELMCORNER')).toBe(truth.get('ELMCORNER'));
  });
});

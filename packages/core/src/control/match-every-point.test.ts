import { describe, expect, it } from 'vitest';
import { applyHelmert, ITRF2014_TO_ETRF2000 } from '../frames/index.js';
import type { ControlMark } from './control-csv.js';
import { matchEveryPoint } from './match-every-point.js';

// A point in ITRF2014 and a mark at the same place in ETRF2000 (EUREF TN1 parameters as shipped, from
// memory): the frames differ by about half a metre in Europe at 2024 (parameter-sets.ts), so a distance
// taken before the transformation is wrong by that much.
describe('matching every point to a mark, distances after the frame transformation', () => {
  const itrf = { ecef: { x: 4296336.3, y: 663671.8, z: 4651992.4 }, frame: { name: 'ITRF2014', epochYear: 2024.37 } };
  const etrf = applyHelmert(itrf.ecef, 2024.37, ITRF2014_TO_ETRF2000);
  const mark: ControlMark = { name: 'M1', position: { ecef: etrf, frame: { name: 'ETRF2000', epochYear: 2024.37 } }, file: 'm.csv', line: 2 };

  it('a proximity match measures the distance in the mark\'s frame when a transformation is given', () => {
    const raw = matchEveryPoint([{ name: 'P', position: itrf }], [mark], 5)[0]!;
    expect(raw.horizontalDistanceM).toBeGreaterThan(0.2);
    const after = matchEveryPoint([{ name: 'P', position: itrf }], [mark], 5, [ITRF2014_TO_ETRF2000])[0]!;
    expect(after.horizontalDistanceM).toBeLessThan(1e-6);
  });

  it('re-occupations by name all match the same mark', () => {
    const m = matchEveryPoint([{ name: 'm1', position: itrf }, { name: 'M1 ', position: itrf }], [mark], 5, [ITRF2014_TO_ETRF2000]);
    expect(m.map((x) => [x.by, x.mark.name])).toEqual([['name', 'M1'], ['name', 'M1']]);
  });
});

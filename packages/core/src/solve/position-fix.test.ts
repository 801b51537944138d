import { describe, expect, it } from 'vitest';
import { solvePositionFix, DEFAULT_FIX_OPTIONS, type LinearRow } from './position-fix.js';
import { dilutionOfPrecision } from './index.js';
import { geodeticToEcef, enuToEcefDelta } from '../geodesy/index.js';
import { rng } from '../../../../test/support/random.js';

describe('position fix', () => {
  it('its DOPs equal solve/dop.ts on random geometries (which is checked against check-values.md #9)', () => {
    const r = rng(42);
    for (let trial = 0; trial < 200; trial++) {
      const latRad = (r() - 0.5) * 3, lonRad = (r() - 0.5) * 6;
      const x = geodeticToEcef({ latRad, lonRad, heightM: 100 });
      const rows: LinearRow[] = [];
      const m = 6 + Math.floor(r() * 8);
      for (let i = 0; i < m; i++) {
        const az = r() * 2 * Math.PI, el = 0.1 + r() * 1.4;
        const d = enuToEcefDelta({ e: Math.cos(el) * Math.sin(az), n: Math.cos(el) * Math.cos(az), u: Math.sin(el) }, latRad, lonRad);
        rows.push({ sat: `S${i}`, system: i % 3 === 0 ? 'E' : 'G', losX: d.x, losY: d.y, losZ: d.z, misclosureM: 0, varianceM2: 1 + r() });
      }
      const fix = solvePositionFix(() => rows, x, { ...DEFAULT_FIX_OPTIONS, minSatellites: 5 });
      if (!fix.ok) continue;
      const los = rows.flatMap((q) => [q.losX, q.losY, q.losZ]);
      const sys = [...new Set(rows.map((q) => q.system))];
      const ref = dilutionOfPrecision({ lineOfSight: los, frame: 'ecef', receiver: x, clockIndex: rows.map((q) => sys.indexOf(q.system)) })!;
      for (const k of ['gdop', 'pdop', 'hdop', 'vdop', 'tdop'] as const) expect(fix.dops![k]).toBeCloseTo(ref[k], 9);
    }
  });
});

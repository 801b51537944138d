/** A small example scenario (10 minutes, two points 100 m apart), for tests and quick experiments. */
import { secondsFromCalendar } from '@refdelta/core';
import type { ErrorSpec } from './errors.js';
import type { ScenarioSpec } from './scenario.js';

export function exampleScenarioSpec(errors: ErrorSpec = {}, seed: number | string = 7): ScenarioSpec {
  return {
    seed,
    startGpsS: secondsFromCalendar({ year: 2024, month: 3, day: 2, hour: 13, minute: 0, second: 0 }),
    durationS: 600,
    reference: { markGeodetic: { latDeg: 40, lonDeg: 10, heightM: 100 }, antennaHeightM: 0.1, markerName: 'EXREF', intervalS: 5 },
    rover: {
      intervalS: 1,
      startOffsetS: 60,
      plan: [
        { kind: 'static', point: 'A', durationS: 200, antennaHeightM: 1.5 },
        { kind: 'walk', to: 'B' },
        { kind: 'static', point: 'B', durationS: 150, antennaHeightM: 2 },
      ],
    },
    points: { A: { e: 500, n: 300, u: 2 }, B: { e: 560, n: 380, u: 1 } },
    systems: ['G', 'E'],
    errors,
  };
}

// The benchmark's simulated session: a reference on a mark logging GPS + Galileo (or, for the carrier-phase
// part, GPS + GLONASS) every 30 s (dual-frequency, CORS-like) and a low-cost single-frequency rover at 1 Hz that alternates
// 20-minute static occupations of two points 300 m apart with walks between them. Every simulated
// error source is on (faults included, so quality control has blunders to find).
// The text is produced by the core's own writers (writeObsRinex3 / writeNavRinex3).

const OCCUPATION_S = 1200;
const WALK_SPEED_MS = 1.2;
const POINTS = { NORTHPEG: { e: 800, n: 600, u: -3 }, EASTPEG: { e: 1100, n: 600, u: -2 } };
/** Walk time the simulator uses: round(horizontal distance / speed) (sim/trajectory.ts). */
const WALK_S = Math.max(1, Math.round(300 / WALK_SPEED_MS));

/** Scenario spec for a rover session of `roverS` seconds starting `startGpsS`. */
export function benchScenarioSpec(core, roverS, seed = 20240110, systems = SESSION_SYSTEMS) {
  const startGpsS = core.secondsFromCalendar({ year: 2024, month: 1, day: 10, hour: 0, minute: 0, second: 0 });
  const plan = [];
  const names = Object.keys(POINTS);
  let left = roverS;
  let k = 0;
  for (;;) {
    const stay = Math.min(OCCUPATION_S, left);
    plan.push({ kind: 'static', point: names[k % 2], durationS: stay, antennaHeightM: 1.8 });
    left -= stay;
    if (left < WALK_S + 60) {
      plan[plan.length - 1] = { ...plan[plan.length - 1], durationS: stay + left };
      break;
    }
    k++;
    plan.push({ kind: 'walk', to: names[k % 2], speedMS: WALK_SPEED_MS });
    left -= WALK_S;
  }
  return {
    seed,
    startGpsS,
    durationS: roverS + 60,
    reference: { markGeodetic: { latDeg: 47.123456, lonDeg: 8.765432, heightM: 412.345 }, antennaHeightM: 0.08, markerName: 'BREF', intervalS: 30, dualFrequency: true },
    rover: { intervalS: 1, plan, markerNumber: 'BENCH-ROVER' },
    points: POINTS,
    systems,
    errors: core.ALL_ERRORS_ON,
  };
}

/** The scenario's three files as lazily generated text chunks. */
export function scenarioTexts(core, sim) {
  return {
    rover: () => core.writeObsRinex3(sim.roverHeader, sim.roverEpochs()),
    reference: () => core.writeObsRinex3(sim.referenceHeader, sim.referenceEpochs()),
    nav: () => core.writeNavRinex3(sim.nav),
  };
}

/** Text held in memory, handed out as ~64 KiB chunks (what openText hands a reader). */
export async function* memoryChunks(text, n = 1 << 16) {
  for (let i = 0; i < text.length; i += n) yield text.slice(i, i + n);
}

/** A synchronous chunk generator as the async iterable the readers take. */
export async function* asAsync(chunks) {
  for (const c of chunks) yield c;
}

export const SESSION_SYSTEMS = ['G', 'E'];
/** The carrier-phase part's constellations: GPS + GLONASS (FDMA: one wavelength per satellite). */
export const CARRIER_SYSTEMS = ['G', 'R'];

/**
 * sky.csv: where the reference receiver saw its satellites during the session (azimuth/elevation from
 * the broadcast ephemerides at the reference coordinate), sampled at most 180 times over the session.
 * The rover's directions are in residuals.csv already; this is what the report's sky plot needs for the
 * reference. Inputs, coordinate and span come from the run's summary document.
 */
import { existsSync } from 'node:fs';
import { EphemerisStore, SECONDS_PER_WEEK, SKY_CSV_COLUMNS, satelliteDirections, type SatId } from '@refdelta/core';
import { openNav, openObs } from './node-io.js';

/** Sampled epochs over the session (the sky plot draws at most this many vertices per satellite). */
const SAMPLES = 180;

type J = Record<string, unknown>;

/** The CSV text, or null when the summary does not give what it needs (inputs, coordinate, span). */
export async function referenceSkyCsv(summaryDoc: J): Promise<string | null> {
  const inputs = (Array.isArray(summaryDoc.inputs) ? summaryDoc.inputs : []) as J[];
  const refs = inputs.filter((i) => i.kind === 'reference').map((i) => String(i.path)).filter((p) => existsSync(p));
  const navs = inputs.filter((i) => i.kind === 'navigation').map((i) => String(i.path)).filter((p) => existsSync(p));
  const pos = ((summaryDoc.reference as J | undefined)?.position ?? {}) as J;
  const span = (summaryDoc.time_span ?? {}) as J;
  const [t0, t1] = [Number(span.first_gps_s), Number(span.last_gps_s)];
  if (!refs.length || !navs.length || typeof pos.x_m !== 'number' || !Number.isFinite(t0) || !Number.isFinite(t1)) return null;
  const receiver = { x: Number(pos.x_m), y: Number(pos.y_m), z: Number(pos.z_m) };
  const store = new EphemerisStore((await openNav(navs, () => {})).nav);
  const stepS = Math.max(1, (t1 - t0) / SAMPLES);
  const lines: string[] = [SKY_CSV_COLUMNS.join(',')];
  let next = t0;
  for (const path of refs) {
    const obs = await openObs(path, () => {});
    for await (const ep of obs.epochs) {
      if ((ep.flag !== 0 && ep.flag !== 1) || ep.tagGpsS < next - 0.5) continue;
      if (ep.tagGpsS > t1 + 0.5) break;
      next = ep.tagGpsS + stepS;
      const sats = ep.sats.filter((s) => s.values.some((v) => Number.isFinite(v))).map((s) => s.sat as SatId);
      const week = Math.floor(ep.tagGpsS / SECONDS_PER_WEEK);
      const tow = (ep.tagGpsS - week * SECONDS_PER_WEEK).toFixed(3);
      for (const d of satelliteDirections(store, receiver, ep.tagGpsS, sats)) {
        lines.push(`reference,${week},${tow},${d.satellite},${d.azimuthDeg.toFixed(2)},${d.elevationDeg.toFixed(2)}`);
      }
    }
  }
  return lines.length > 1 ? lines.join('\n') + '\n' : null;
}

/**
 * The rover's linearisation point for one epoch: iterated weighted least squares on the between-receiver
 * code differences (reference already reduced by its modelled range), unknowns the position and one
 * relative clock per constellation. Weights sin^2(el) (common practice); residuals beyond 5 robust sigma
 * (1.4826 MAD, at least 1 m) are dropped once. Null when fewer satellites than unknowns + 1.
 */
import type { EcefM, GnssSystem } from '../gnss/index.js';
import { azimuthElevation, ecefToGeodetic } from '../geodesy/index.js';
import { troposphereDelayM } from '../observables/index.js';

export interface CodeRow {
  readonly system: GnssSystem;
  readonly satM: EcefM;
  readonly satClockM: number;
  /** Rover pseudorange minus the reference's reduced code (m). */
  readonly codeM: number;
}

function solveNormal(n: number, a: Float64Array, b: Float64Array): boolean {
  for (let c = 0; c < n; c++) {
    let p = c;
    for (let r = c + 1; r < n; r++) if (Math.abs(a[r * n + c]) > Math.abs(a[p * n + c])) p = r;
    if (!(Math.abs(a[p * n + c]) > 1e-12)) return false;
    if (p !== c) {
      for (let j = 0; j < n; j++) { const t = a[c * n + j]; a[c * n + j] = a[p * n + j]; a[p * n + j] = t; }
      const t = b[c]; b[c] = b[p]; b[p] = t;
    }
    for (let r = c + 1; r < n; r++) {
      const f = a[r * n + c] / a[c * n + c];
      if (f === 0) continue;
      for (let j = c; j < n; j++) a[r * n + j] -= f * a[c * n + j];
      b[r] -= f * b[c];
    }
  }
  for (let r = n - 1; r >= 0; r--) {
    let s = b[r];
    for (let j = r + 1; j < n; j++) s -= a[r * n + j] * b[j];
    b[r] = s / a[r * n + r];
  }
  return true;
}

/** Ascending order of numbers (one function for every sort of the module). */
const ascending = (p: number, q: number): number => p - q;

/** The median of the values (sorted in place). */
function medianInPlace(v: number[]): number {
  v.sort(ascending);
  const m = v.length >> 1;
  return v.length % 2 ? v[m] : 0.5 * (v[m - 1] + v[m]);
}

/** Whether every row with a code is kept. */
function allKept(rows: readonly CodeRow[], keep: readonly boolean[]): boolean {
  for (let i = 0; i < rows.length; i++) if (!keep[i] && Number.isFinite(rows[i].codeM)) return false;
  return true;
}

export function codeFixPosition(rows: readonly CodeRow[], start: EcefM, maskRad: number, doy: number): EcefM | null {
  const systems: GnssSystem[] = [];
  // Each row's clock (index into systems) and whether it is kept.
  const clockOf = new Int32Array(rows.length);
  const keep: boolean[] = [];
  for (let i = 0; i < rows.length; i++) {
    let si = systems.indexOf(rows[i].system);
    if (si < 0) { si = systems.length; systems.push(rows[i].system); }
    clockOf[i] = si;
    keep.push(Number.isFinite(rows[i].codeM));
  }
  const n = 3 + systems.length;
  // Positions always built as { x, y, z } literals: one object shape for the optimised code.
  let x: EcefM = { x: start.x, y: start.y, z: start.z };
  const h = new Float64Array(n);
  const a = new Float64Array(n * n);
  const b = new Float64Array(n);
  const res: number[] = [];
  const resIdx: number[] = [];
  const sysUsed = new Uint8Array(systems.length);
  // Look angles and troposphere change with metres of position only in millimetres: computed at the start
  // and again only after a step of more than 100 m.
  let lookAt: EcefM | null = null;
  const elevation = new Float64Array(rows.length), tropo = new Float64Array(rows.length);
  let screened = false;
  for (let iter = 0; iter < 8; iter++) {
    if (lookAt === null || Math.hypot(x.x - lookAt.x, x.y - lookAt.y, x.z - lookAt.z) > 100) {
      lookAt = x;
      const g = ecefToGeodetic(x);
      for (let i = 0; i < rows.length; i++) {
        elevation[i] = azimuthElevation(x, rows[i].satM, g.latRad, g.lonRad).elevationRad;
        tropo[i] = elevation[i] >= maskRad ? troposphereDelayM(g, elevation[i], doy) : 0;
      }
    }
    a.fill(0); b.fill(0); sysUsed.fill(0);
    res.length = 0; resIdx.length = 0;
    let count = 0, systemsUsed = 0;
    for (let i = 0; i < rows.length; i++) {
      if (!keep[i]) continue;
      const r = rows[i];
      const dx = r.satM.x - x.x, dy = r.satM.y - x.y, dz = r.satM.z - x.z;
      const rho = Math.sqrt(dx * dx + dy * dy + dz * dz);
      const el = elevation[i];
      if (el < maskRad) continue;
      const y = r.codeM - (rho - r.satClockM + tropo[i]);
      h.fill(0);
      h[0] = -dx / rho; h[1] = -dy / rho; h[2] = -dz / rho;
      const si = clockOf[i];
      h[3 + si] = 1;
      if (sysUsed[si] === 0) { sysUsed[si] = 1; systemsUsed++; }
      const w = Math.sin(el) ** 2;
      for (let p = 0; p < n; p++) { b[p] += w * h[p] * y; for (let q = 0; q < n; q++) a[p * n + q] += w * h[p] * h[q]; }
      res.push(y); resIdx.push(i);
      count++;
    }
    // Constellations without a satellite: pin their clock.
    for (let si = 0; si < systems.length; si++) if (sysUsed[si] === 0) a[(3 + si) * n + 3 + si] = 1;
    if (count < 3 + systemsUsed + 1) return null;
    if (!solveNormal(n, a, b)) return null;
    x = { x: x.x + b[0], y: x.y + b[1], z: x.z + b[2] };
    const step = Math.hypot(b[0], b[1], b[2]);
    const converged = step < 0.01 && iter >= 1;
    if (converged && screened) return x;
    if (converged || iter === 4) {
      screened = true;
      // Drop residuals beyond 5 robust sigma about the median (per constellation clocks are in the median's spread).
      for (let si = 0; si < systems.length; si++) {
        const l: number[] = [];
        for (let q = 0; q < res.length; q++) if (clockOf[resIdx[q]] === si) l.push(res[q]);
        if (l.length < 3) continue;
        const m = medianInPlace(l);
        const deviations: number[] = [];
        for (let q = 0; q < l.length; q++) deviations.push(Math.abs(l[q] - m));
        const mad = Math.max(1, 1.4826 * medianInPlace(deviations));
        // Written for every residual of the constellation (a store met only at an outlier left the optimised
        // code without feedback for it, and that code was entered again and again).
        for (let q = 0; q < res.length; q++) if (clockOf[resIdx[q]] === si) keep[resIdx[q]] = !(Math.abs(res[q] - m) > 5 * mad);
      }
      if (converged && allKept(rows, keep)) return x;
    }
  }
  return x;
}

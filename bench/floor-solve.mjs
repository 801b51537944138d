// The floor of a code-differential run, as a plain script run as its own process (start-up included):
// the least work any engine must do for `refdelta solve` of the same files. It
//   1. decodes each observation file (Buffer latin1) and splits it into lines, reads every field of
//      every satellite (parseFloat on the 14 columns), RINEX 2 or 3, rover and reference alike;
//   2. reads the GPS records of the navigation files (RINEX 2 or 3);
//   3. per rover epoch: broadcast orbit + clock of every GPS satellite with a C1/C1C code at both ends
//      (IS-GPS-200 table 20-IV), the reference's range corrections at the known point, and a 4x4
//      least-squares fix (x, y, z, clock; normal equations, 3 iterations);
//   4. writes the bytes the engine wrote (the files of the folder given), fsynced.
// No quality control, weights, atmosphere, interpolation or outputs of its own: a floor, not an engine.
// Usage: node bench/floor-solve.mjs ROVER REFERENCE X,Y,Z OUTDIR WRITE_LIKE_DIR NAV...
import { closeSync, fsyncSync, openSync, readdirSync, readFileSync, writeSync } from 'node:fs';
import { join } from 'node:path';

const [roverPath, refPath, refXyz, outDir, likeDir, ...navPaths] = process.argv.slice(2);
const C = 299792458, MU = 3.986005e14, OMEGA_E = 7.2921151467e-5, GPS_EPOCH_MS = Date.UTC(1980, 0, 6);
const gpsS = (y, mo, d, h, mi, s) => (Date.UTC(y < 80 ? y + 2000 : y < 100 ? y + 1900 : y, mo - 1, d, h, mi) - GPS_EPOCH_MS) / 1000 + s;
const lines = (path) => readFileSync(path).toString('latin1').split('\n');

/** Epochs of an observation file: { t, sats: Map(prn -> C1 code or NaN) }; every field is parsed. */
function readObs(path) {
  const L = lines(path);
  let i = 0, v3 = false, types = {}, last = null, fields = 0;
  for (; i < L.length && !L[i].includes('END OF HEADER'); i++) {
    const l = L[i], label = l.slice(60).trim();
    if (label === 'RINEX VERSION / TYPE') v3 = parseFloat(l) >= 3;
    if (label === '# / TYPES OF OBSERV') { if (l.slice(0, 6).trim()) types.G = []; for (let c = 10; c < 60; c += 6) if (l.slice(c, c + 2).trim()) types.G.push(l.slice(c, c + 2)); }
    if (label === 'SYS / # / OBS TYPES') { if (l[0] !== ' ') types[last = l[0]] = []; for (let c = 7; c < 59; c += 4) if (l.slice(c, c + 3).trim()) types[last].push(l.slice(c, c + 3)); }
  }
  const epochs = [];
  const code = v3 ? 'C1C' : 'C1';
  for (i++; i < L.length; i++) {
    const l = L[i];
    if (l.length < 20) continue;
    const e = { t: 0, sats: new Map() };
    if (v3) {
      e.t = gpsS(+l.slice(2, 6), +l.slice(7, 9), +l.slice(10, 12), +l.slice(13, 15), +l.slice(16, 18), parseFloat(l.slice(19, 29)));
      const n = +l.slice(32, 35);
      for (let k = 0; k < n; k++) {
        const s = L[++i], ty = types[s[0]] ?? [];
        for (let f = 0; f < ty.length; f++) { const v = parseFloat(s.slice(3 + 16 * f, 17 + 16 * f)); fields++; if (s[0] === 'G' && ty[f] === code) e.sats.set(s.slice(0, 3), v); }
      }
    } else {
      e.t = gpsS(+l.slice(1, 3), +l.slice(4, 6), +l.slice(7, 9), +l.slice(10, 12), +l.slice(13, 15), parseFloat(l.slice(15, 26)));
      const n = +l.slice(29, 32), ids = [];
      for (let k = 0; k < n; k++) { if (k > 0 && k % 12 === 0) i++; const s = L[i].slice(32 + 3 * (k % 12), 35 + 3 * (k % 12)); ids.push(s[0] === ' ' ? 'G' + s.slice(1).replace(' ', '0') : s); }
      const ty = types.G, per = Math.ceil(ty.length / 5);
      for (const id of ids) {
        for (let r = 0; r < per; r++) {
          const s = L[++i];
          for (let f = 5 * r; f < Math.min(ty.length, 5 * r + 5); f++) { const v = parseFloat(s.slice(16 * (f - 5 * r), 16 * (f - 5 * r) + 14)); fields++; if (id[0] === 'G' && ty[f] === code) e.sats.set(id, v); }
        }
      }
    }
    epochs.push(e);
  }
  return { epochs, fields };
}

/** GPS broadcast records by satellite: { toe (GPS s), the 28 numbers of the record }. */
function readNav(path, bySat) {
  const L = lines(path);
  let i = 0, v3 = false;
  for (; i < L.length && !L[i].includes('END OF HEADER'); i++) if (L[i].slice(60).trim() === 'RINEX VERSION / TYPE') v3 = parseFloat(L[i]) >= 3;
  const num = (s) => parseFloat(s.replace(/[dD]/, 'e'));
  for (i++; i < L.length; i++) {
    const l = L[i];
    if (l.trim() === '') continue;
    const sys = v3 ? l[0] : 'G', len = sys === 'R' || sys === 'S' ? 4 : 8, w = v3 ? 4 : 3;
    if (sys !== 'G') { i += len - 1; continue; }
    const sat = v3 ? l.slice(0, 3) : 'G' + l.slice(0, 2).replace(' ', '0');
    const x = [num(l.slice(w + 19, w + 38)), num(l.slice(w + 38, w + 57)), num(l.slice(w + 57, w + 76))];
    for (let k = 1; k < len; k++) { const s = L[i + k] ?? ''; for (let c = w; c < w + 76; c += 19) x.push(num(s.slice(c, c + 19))); }
    i += len - 1;
    const rec = { toe: x[11] + 604800 * x[21], x };
    (bySat.get(sat) ?? bySat.set(sat, []).get(sat)).push(rec);
  }
}

/** Satellite ECEF (m) and clock (s) at GPS time t (IS-GPS-200 table 20-IV). */
function orbit(r, t) {
  const [af0, af1, af2, , crs, dn, m0, cuc, e, cus, sqrtA, toe, cic, om0, cis, i0, crc, w, omDot, idot] = r.x;
  const A = sqrtA * sqrtA, tk = t - r.toe, n = Math.sqrt(MU / (A * A * A)) + dn;
  let E = m0 + n * tk;
  for (let k = 0; k < 8; k++) E = m0 + n * tk + e * Math.sin(E);
  const v = Math.atan2(Math.sqrt(1 - e * e) * Math.sin(E), Math.cos(E) - e), phi = v + w;
  const s2 = Math.sin(2 * phi), c2 = Math.cos(2 * phi);
  const u = phi + cus * s2 + cuc * c2, rr = A * (1 - e * Math.cos(E)) + crs * s2 + crc * c2, inc = i0 + idot * tk + cis * s2 + cic * c2;
  const xp = rr * Math.cos(u), yp = rr * Math.sin(u), om = om0 + (omDot - OMEGA_E) * tk - OMEGA_E * toe;
  const dt = t - r.toe;
  return { x: xp * Math.cos(om) - yp * Math.cos(inc) * Math.sin(om), y: xp * Math.sin(om) + yp * Math.cos(inc) * Math.cos(om), z: yp * Math.sin(inc), clk: af0 + af1 * dt + af2 * dt * dt };
}

/** Satellite position at transmission for a pseudorange, Earth rotation during the flight applied. */
function atTransmission(r, t, p) {
  const o = orbit(r, t - p / C), a = OMEGA_E * p / C;
  return { x: o.x * Math.cos(a) + o.y * Math.sin(a), y: o.y * Math.cos(a) - o.x * Math.sin(a), z: o.z, clk: o.clk };
}

const nearest = (list, t) => { let b = null; for (const r of list ?? []) if (!b || Math.abs(r.toe - t) < Math.abs(b.toe - t)) b = r; return b; };
const nav = new Map();
for (const p of navPaths) readNav(p, nav);
const rover = readObs(roverPath), reference = readObs(refPath);
const [X0, Y0, Z0] = refXyz.split(',').map(Number);
let solved = 0, maxOffsetM = 0, j = 0;
for (const e of rover.epochs) {
  // The reference epoch nearest in time (both files in time order), within 30 s.
  while (j + 1 < reference.epochs.length && Math.abs(reference.epochs[j + 1].t - e.t) <= Math.abs(reference.epochs[j].t - e.t)) j++;
  const ref = reference.epochs[j];
  if (!ref || Math.abs(ref.t - e.t) > 30) continue;
  const obs = [];
  for (const [sat, p] of e.sats) {
    const q = ref.sats.get(sat), r = nearest(nav.get(sat), e.t);
    if (!(p > 0) || !(q > 0) || !r) continue;
    const sr = atTransmission(r, e.t, q), s = atTransmission(r, e.t, p);
    const corr = Math.hypot(sr.x - X0, sr.y - Y0, sr.z - Z0) - q + C * sr.clk;
    obs.push({ s, p: p + corr - C * s.clk });
  }
  if (obs.length < 4) continue;
  const x = [X0, Y0, Z0, 0];
  for (let it = 0; it < 3; it++) {
    const N = [[0, 0, 0, 0, 0], [0, 0, 0, 0, 0], [0, 0, 0, 0, 0], [0, 0, 0, 0, 0]];
    for (const o of obs) {
      const dx = o.s.x - x[0], dy = o.s.y - x[1], dz = o.s.z - x[2], rho = Math.hypot(dx, dy, dz);
      const a = [-dx / rho, -dy / rho, -dz / rho, 1], w = o.p - rho - x[3];
      for (let j = 0; j < 4; j++) { for (let k = 0; k < 4; k++) N[j][k] += a[j] * a[k]; N[j][4] += a[j] * w; }
    }
    for (let j = 0; j < 4; j++) for (let k = j + 1; k < 4; k++) { const f = N[k][j] / N[j][j]; for (let m = j; m < 5; m++) N[k][m] -= f * N[j][m]; }
    const d = [0, 0, 0, 0];
    for (let j = 3; j >= 0; j--) { let s = N[j][4]; for (let k = j + 1; k < 4; k++) s -= N[j][k] * d[k]; d[j] = s / N[j][j]; }
    for (let j = 0; j < 4; j++) x[j] += d[j];
  }
  solved++;
  maxOffsetM = Math.max(maxOffsetM, Math.hypot(x[0] - X0, x[1] - Y0, x[2] - Z0));
}
let bytes = 0;
for (const name of readdirSync(likeDir)) {
  const data = readFileSync(join(likeDir, name));
  const fd = openSync(join(outDir, name), 'w');
  writeSync(fd, data);
  fsyncSync(fd);
  closeSync(fd);
  bytes += data.length;
}
console.log(JSON.stringify({ epochs: rover.epochs.length, solved, maxOffsetM, fields: rover.fields + reference.fields, bytes }));

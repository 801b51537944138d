/**
 * The prepared between-receiver single differences of a whole session, kept compactly in typed arrays so
 * that the filter can run over them forwards and then backwards without reading the files again.
 *
 * Memory: per epoch 8 * 8 + 4 * 4 bytes (times, linearisation point, velocity, indices: 80 bytes);
 * per satellite and epoch 2 + 4 + 8 + 8 + 3 * 4 + 4 + 1 = 39 bytes (about 40): a day at 1 Hz with 20
 * satellites is about 86,400 * (80 + 20 * 40) = 76 MB.
 *
 * Per satellite: single difference (rover minus reference) of phase and of code, each reduced by the
 * modelled range from the rover's linearisation point x0 (range, broadcast satellite clock, troposphere),
 * so that sd = -u . (x - x0) + c (dt_rover - dt_reference) [+ lambda N for phase] + noise, with u the unit
 * vector from x0 to the satellite.
 */
export class EpochRecords {
  count = 0;
  satTotal = 0;
  // Per epoch.
  timeGpsS = new Float64Array(1024);
  tagGpsS = new Float64Array(1024);
  x0 = new Float64Array(3 * 1024);
  velocity = new Float64Array(4 * 1024); // vx, vy, vz, sigma (m/s); NaN when none
  satStart = new Int32Array(1024);
  satCount = new Uint16Array(1024);
  /** 1: static epoch (the position of the previous epoch carries over exactly). */
  isStatic = new Uint8Array(1024);
  referenceAgeS = new Float32Array(1024);
  /** Index of the epoch's context (point name, event, antenna height) in `contexts`. */
  context = new Int32Array(1024);
  // Per satellite.
  sat = new Uint16Array(8192);
  arc = new Int32Array(8192);
  phaseM = new Float64Array(8192);
  codeM = new Float64Array(8192);
  los = new Float32Array(3 * 8192);
  elevationRad = new Float32Array(8192);
  /** 1 when the ambiguity may be fixed (constellation fixable, half cycle resolved at both receivers). */
  fixable = new Uint8Array(8192);

  private growEpochs(): void {
    const n = this.timeGpsS.length * 2;
    const g = <T extends Float64Array | Int32Array | Uint16Array | Uint8Array | Float32Array>(a: T, k = 1): T => {
      const b = new (a.constructor as new (n: number) => T)(n * k);
      b.set(a);
      return b;
    };
    this.timeGpsS = g(this.timeGpsS); this.tagGpsS = g(this.tagGpsS); this.x0 = g(this.x0, 3); this.velocity = g(this.velocity, 4);
    this.satStart = g(this.satStart); this.satCount = g(this.satCount); this.isStatic = g(this.isStatic);
    this.referenceAgeS = g(this.referenceAgeS); this.context = g(this.context);
  }

  private growSats(need: number): void {
    let n = this.sat.length;
    while (n < need) n *= 2;
    const g = <T extends Float64Array | Int32Array | Uint16Array | Uint8Array | Float32Array>(a: T, k = 1): T => {
      const b = new (a.constructor as new (n: number) => T)(n * k);
      b.set(a);
      return b;
    };
    this.sat = g(this.sat); this.arc = g(this.arc); this.phaseM = g(this.phaseM); this.codeM = g(this.codeM);
    this.los = g(this.los, 3); this.elevationRad = g(this.elevationRad); this.fixable = g(this.fixable);
  }

  /** Starts an epoch; returns its index. */
  beginEpoch(timeGpsS: number, tagGpsS: number, x0: { x: number; y: number; z: number }, isStatic: boolean, referenceAgeS: number, context: number): number {
    if (this.count === this.timeGpsS.length) this.growEpochs();
    const k = this.count++;
    this.timeGpsS[k] = timeGpsS;
    this.tagGpsS[k] = tagGpsS;
    this.x0[3 * k] = x0.x; this.x0[3 * k + 1] = x0.y; this.x0[3 * k + 2] = x0.z;
    this.velocity.fill(NaN, 4 * k, 4 * k + 4);
    this.satStart[k] = this.satTotal;
    this.satCount[k] = 0;
    this.isStatic[k] = isStatic ? 1 : 0;
    this.referenceAgeS[k] = referenceAgeS;
    this.context[k] = context;
    return k;
  }

  setVelocity(k: number, vx: number, vy: number, vz: number, sigmaMS: number): void {
    this.velocity[4 * k] = vx; this.velocity[4 * k + 1] = vy; this.velocity[4 * k + 2] = vz; this.velocity[4 * k + 3] = sigmaMS;
  }

  addSatellite(k: number, sat: number, arc: number, phaseM: number, codeM: number, ux: number, uy: number, uz: number, elevationRad: number, fixable: boolean): void {
    if (this.satTotal + 1 > this.sat.length) this.growSats(this.satTotal + 1);
    const j = this.satTotal++;
    this.sat[j] = sat; this.arc[j] = arc; this.phaseM[j] = phaseM; this.codeM[j] = codeM;
    this.los[3 * j] = ux; this.los[3 * j + 1] = uy; this.los[3 * j + 2] = uz;
    this.elevationRad[j] = elevationRad; this.fixable[j] = fixable ? 1 : 0;
    this.satCount[k]++;
  }
}

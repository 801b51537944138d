/**
 * UTM zone choice: standard 6-degree zones numbered 1..60 eastwards from 180 W, central meridian
 * -183 + 6 zone (DMA TM 8358.2 "The Universal Grids", section 2), with the two published exceptions:
 * - Norway: between 56 N and 64 N, zone 32 is widened to 3 E..12 E (zone 31 stops at 3 E);
 * - Svalbard: between 72 N and 84 N, zones 32, 34 and 36 are not used; 31 covers 0..9 E, 33 9..21 E,
 *   35 21..33 E, 37 33..42 E.
 * Both exceptions are handled. UTM is defined from 80 S to 84 N; outside, the polar (UPS) grids apply
 * and this module refuses.
 */
export interface UtmZone {
  readonly zone: number;
  readonly south: boolean;
}

export function utmZoneFor(latDeg: number, lonDeg: number): UtmZone {
  if (!(latDeg >= -80 && latDeg <= 84)) {
    throw new RangeError(`latitude ${latDeg} deg is outside the UTM range 80 S..84 N (use a polar stereographic PROJ string)`);
  }
  if (!Number.isFinite(lonDeg)) throw new RangeError(`longitude ${lonDeg} is not a number`);
  const lon = ((((lonDeg + 180) % 360) + 360) % 360) - 180;
  let zone = Math.floor((lon + 180) / 6) + 1;
  if (zone > 60) zone = 60;
  // DMA TM 8358.2: Norway exception (grid zone 32V).
  if (latDeg >= 56 && latDeg < 64 && lon >= 3 && lon < 12) zone = 32;
  // DMA TM 8358.2: Svalbard exceptions (grid zones 31X, 33X, 35X, 37X).
  if (latDeg >= 72 && latDeg <= 84 && lon >= 0 && lon < 42) {
    if (lon < 9) zone = 31;
    else if (lon < 21) zone = 33;
    else if (lon < 33) zone = 35;
    else zone = 37;
  }
  return { zone, south: latDeg < 0 };
}

/** Central meridian of a UTM zone in degrees (DMA TM 8358.2). */
export function utmCentralMeridianDeg(zone: number): number {
  return -183 + 6 * zone;
}

/** A part of a UTM zone: its longitudes between two latitudes (degrees; west < east, both in -180..180). */
export interface UtmZoneBand {
  readonly southDeg: number;
  readonly northDeg: number;
  readonly westDeg: number;
  readonly eastDeg: number;
  /** The exception this part is, when it is one. */
  readonly exception?: 'Norway' | 'Svalbard';
}

/** Latitudes of the exceptions (DMA TM 8358.2): Norway 56 N..64 N, Svalbard 72 N..84 N. */
const NORWAY = { southDeg: 56, northDeg: 64 };
const SVALBARD = { southDeg: 72, northDeg: 84 };
/** Longitudes of the exception zones there (DMA TM 8358.2): 31V, 32V; 31X, 33X, 35X, 37X (none for 32X, 34X, 36X). */
const NORWAY_BANDS: Readonly<Record<number, readonly [number, number]>> = { 31: [0, 3], 32: [3, 12] };
const SVALBARD_BANDS: Readonly<Record<number, readonly [number, number] | null>> = { 31: [0, 9], 32: null, 33: [9, 21], 34: null, 35: [21, 33], 36: null, 37: [33, 42] };

/**
 * The parts of a UTM zone, from 80 S to 84 N, as utmZoneFor assigns points to it: the 6-degree band
 * cm - 3..cm + 3, cut at the Norway and Svalbard exceptions, with the exception band between their latitudes.
 */
export function utmZoneBands(zone: number): UtmZoneBand[] {
  const cm = utmCentralMeridianDeg(zone);
  const nominal: readonly [number, number] = [cm - 3, cm + 3];
  const norway = NORWAY_BANDS[zone], svalbard = zone in SVALBARD_BANDS ? SVALBARD_BANDS[zone] : nominal;
  const band = (southDeg: number, northDeg: number, [westDeg, eastDeg]: readonly [number, number], exception?: UtmZoneBand['exception']): UtmZoneBand =>
    ({ southDeg, northDeg, westDeg, eastDeg, ...(exception ? { exception } : {}) });
  return [
    band(-80, NORWAY.southDeg, nominal),
    norway ? band(NORWAY.southDeg, NORWAY.northDeg, norway, 'Norway') : band(NORWAY.southDeg, NORWAY.northDeg, nominal),
    band(NORWAY.northDeg, SVALBARD.southDeg, nominal),
    ...(svalbard === nominal ? [band(SVALBARD.southDeg, SVALBARD.northDeg, nominal)] : svalbard ? [band(SVALBARD.southDeg, SVALBARD.northDeg, svalbard, 'Svalbard')] : []),
  ];
}

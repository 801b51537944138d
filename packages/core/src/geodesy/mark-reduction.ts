/**
 * The ground mark and the antenna reference point (ARP): RINEX ANTENNA: DELTA H/E/N gives the ARP's height
 * above the mark and its east/north eccentricities (RINEX 3.05, table A2), applied along the local
 * ellipsoidal east/north/up axes at the point.
 */
import type { AntennaOffset, EcefM } from '../gnss/index.js';
import { ecefToGeodetic } from './geodetic.js';
import { enuToEcefDelta } from './enu.js';

/** Position of the antenna reference point from a ground mark and ANTENNA: DELTA H/E/N. */
export function markToArp(mark: EcefM, offset: AntennaOffset): EcefM {
  const g = ecefToGeodetic(mark);
  const d = enuToEcefDelta({ e: offset.eastM, n: offset.northM, u: offset.heightM }, g.latRad, g.lonRad);
  return { x: mark.x + d.x, y: mark.y + d.y, z: mark.z + d.z };
}

/** Position of the ground mark from the antenna reference point and ANTENNA: DELTA H/E/N. */
export function arpToMark(arp: EcefM, offset: AntennaOffset): EcefM {
  const g = ecefToGeodetic(arp);
  const d = enuToEcefDelta({ e: offset.eastM, n: offset.northM, u: offset.heightM }, g.latRad, g.lonRad);
  return { x: arp.x - d.x, y: arp.y - d.y, z: arp.z - d.z };
}

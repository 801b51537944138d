/**
 * Names of terrestrial reference frames, normalised so that the same frame written several ways
 * compares equal. The canonical forms follow the naming of the frames' own publications: ITRF
 * solutions (IERS, 'ITRF2014'; 'ITRF97' and older keep two digits as published), EUREF's ETRF
 * realisations of ETRS89 ('ETRF2000'), NGS's NAD83 realisations ('NAD83(2011)'), NGA's WGS 84
 * (all realisations G730...G2296 fold into 'WGS84': they agree with each other and with ITRF at the
 * few-cm level, NGA TR8350.2 and its addenda — from memory).
 *
 * IGS realisations (IGS08, IGb08, IGS14, IGb14, IGS20) are aligned to the ITRF of the same name
 * (IGS analysis-centre practice) and are folded into that ITRF here: common practice.
 * ETRS89 (the system) and ETRFyyyy (its realisations) are kept distinct: they differ by up to a few
 * cm; configure an identity transformation if you accept that.
 */
import type { FrameEpoch } from '../gnss/index.js';

export const UNSTATED_FRAME = 'unstated';

/** Expands a two- or four-digit ITRF/ETRF year to the published label. */
function itrfYear(prefix: 'ITRF' | 'ETRF', digits: string): string {
  if (digits.length === 4) return `${prefix}${digits}`;
  const y = Number(digits);
  // ITRF88..ITRF97 and ETRF89..ETRF97 are published with two digits; 00, 05, 08, 14, 20 with four.
  if (y >= 88) return `${prefix}${digits}`;
  return `${prefix}${2000 + y}`;
}

/** Canonical frame name: 'itrf 2014' -> 'ITRF2014', 'WGS-84(G1762)' -> 'WGS84', '' -> 'unstated'. */
export function normaliseFrameName(s: string | undefined | null): string {
  const raw = (s ?? '').trim();
  if (raw === '' || /^(unstated|unknown|none|not stated|-)$/i.test(raw)) return UNSTATED_FRAME;
  const compact = raw.toUpperCase().replace(/[\s_]+/g, '');
  let m = /^WGS-?84(\(G?\d+\)|G\d+)?$/.exec(compact);
  if (m) return 'WGS84';
  m = /^ITRF-?(\d{2}|\d{4})$/.exec(compact);
  if (m) return itrfYear('ITRF', m[1]!);
  m = /^IG[SB](\d{2})$/.exec(compact);
  if (m) return itrfYear('ITRF', m[1]!);
  m = /^ETRF-?(\d{2}|\d{4})$/.exec(compact);
  if (m) return itrfYear('ETRF', m[1]!);
  if (/^ETRS-?89$/.test(compact)) return 'ETRS89';
  m = /^NAD-?83(\((.+)\))?$/.exec(compact);
  if (m) return m[2] ? `NAD83(${m[2]})` : 'NAD83';
  m = /^GDA-?(94|2020)$/.exec(compact);
  if (m) return `GDA${m[1]}`;
  return compact;
}

/** True when the two names denote the same frame after normalisation. */
export function sameFrameName(a: string, b: string): boolean {
  return normaliseFrameName(a) === normaliseFrameName(b);
}

/** True when two framed labels name the same frame (epochs are compared separately: see frame-rule.ts). */
export function sameFrame(a: FrameEpoch, b: FrameEpoch): boolean {
  return sameFrameName(a.name, b.name);
}

/**
 * Frames fixed to a tectonic plate (ETRS89/ETRF on Eurasia, NAD83 on North America, GDA on Australia):
 * station motion in them is mm/yr, not cm/yr. Used only to size the epoch warning.
 */
export function isPlateFixedFrame(name: string): boolean {
  const n = normaliseFrameName(name);
  return n.startsWith('ETRF') || n === 'ETRS89' || n.startsWith('NAD83') || n.startsWith('GDA');
}

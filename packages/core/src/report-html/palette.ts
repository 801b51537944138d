/**
 * Colours: the Okabe-Ito palette (Okabe and Ito 2008, "Color Universal Design"), distinguishable with
 * the common colour-vision deficiencies; every coloured mark also has a text label or a shape.
 */
export const OKABE_ITO = {
  black: '#000000',
  orange: '#E69F00',
  skyBlue: '#56B4E9',
  bluishGreen: '#009E73',
  yellow: '#F0E442',
  blue: '#0072B2',
  vermillion: '#D55E00',
  reddishPurple: '#CC79A7',
} as const;

/** A sequence for categories without a fixed colour (reasons, satellites systems...). */
export const CATEGORY_COLOURS: readonly string[] = [
  OKABE_ITO.vermillion, OKABE_ITO.blue, OKABE_ITO.orange, OKABE_ITO.reddishPurple, OKABE_ITO.bluishGreen, OKABE_ITO.skyBlue, OKABE_ITO.black,
];

const KIND_COLOURS: Readonly<Record<string, string>> = {
  code: OKABE_ITO.blue,
  differential: OKABE_ITO.blue,
  smoothed: OKABE_ITO.bluishGreen,
  standalone: OKABE_ITO.orange,
  float: OKABE_ITO.reddishPurple,
  fixed: OKABE_ITO.black,
  none: '#BBBBBB',
};

/** Colour of a solution kind; kinds not known here get the remaining palette colours in order of appearance. */
export function kindColour(kind: string, unknownIndex: number): string {
  return KIND_COLOURS[kind] ?? [OKABE_ITO.skyBlue, OKABE_ITO.vermillion, OKABE_ITO.yellow][unknownIndex % 3];
}

/** Colour per constellation (RINEX system letter). */
export function systemColour(system: string): string {
  switch (system) {
    case 'G': return OKABE_ITO.blue;
    case 'R': return OKABE_ITO.vermillion;
    case 'E': return OKABE_ITO.bluishGreen;
    case 'C': return OKABE_ITO.reddishPurple;
    case 'J': return OKABE_ITO.orange;
    default: return OKABE_ITO.black;
  }
}

export const SYSTEM_NAMES: Readonly<Record<string, string>> = { G: 'GPS', R: 'GLONASS', E: 'Galileo', C: 'BeiDou', J: 'QZSS', S: 'SBAS', I: 'NavIC' };

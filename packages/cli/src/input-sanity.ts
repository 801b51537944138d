/** Sentences for inputs that are readable as files but hold nothing to process, naming the first problem found. */
import { InputError, SYSTEM_NAMES, formatWarning, type GnssSystem, type ObsHeader, type Warning } from '@refdelta/core';

/** "<what> holds no readable observation epoch", with the first reader warning (file and line) when there is one. */
export function noEpochSentence(what: string, warnings: readonly Warning[], plural = false): string {
  const base = `${what} hold${plural ? '' : 's'} no readable observation epoch`;
  const first = warnings.find((w) => w.line) ?? warnings[0];
  if (!first) return base;
  return `${base}; first problem: ${formatWarning(first)}${warnings.length > 1 ? ` (${warnings.length} problems in all)` : ''}`;
}

/**
 * The rover header must give observation types for at least one allowed system; otherwise the header is
 * what is wrong (not the navigation files that would be blamed later).
 */
export function requireObservationTypes(path: string, header: ObsHeader, systems: readonly GnssSystem[]): void {
  const given = (Object.keys(header.obsCodes) as GnssSystem[]).filter((s) => (header.obsCodes[s]?.length ?? 0) > 0);
  if (given.some((s) => systems.includes(s))) return;
  const label = header.version < 3 ? '# / TYPES OF OBSERV' : 'SYS / # / OBS TYPES';
  if (given.length === 0) throw new InputError(path, 0, `the header of ${path} gives no observation types: its '${label}' records are missing or damaged`);
  // Systems in the header, none of them allowed: most often --systems names others (e.g. E for a GPS + GLONASS file).
  throw new InputError(path, 0, `${path} holds observations of ${given.map((s) => SYSTEM_NAMES[s]).join(', ')} only, and the systems allowed (${systems.join('')}, --systems) are none of them: give --systems with one of ${given.join(', ')}, or check the header's '${label}' records`);
}

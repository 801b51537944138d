/**
 * The names `--outputs` accepts and those written by default: the output registry's kinds
 * (output-registry.ts), kept apart from its writers so that a command line can list them without
 * loading the writers (the DXF and GeoPackage libraries). report.test.ts keeps the two equal.
 */

/** Per-epoch outputs of a solve run, in the registry's order, with whether each is written by default. */
export const SOLVE_OUTPUT_KINDS: readonly { readonly kind: string; readonly defaultOn: boolean }[] = [
  { kind: 'epochs', defaultOn: true },
  { kind: 'residuals', defaultOn: true },
  { kind: 'geojson', defaultOn: true },
  { kind: 'kml', defaultOn: false },
  { kind: 'gpkg', defaultOn: false },
];

/** Per-point outputs of a points run besides those always written. */
export const POINTS_OUTPUT_KINDS: readonly string[] = ['kml', 'dxf'];

/** Kinds of --outputs: the registered formats plus the summary. */
export function outputKinds(): string[] {
  return [...new Set([...SOLVE_OUTPUT_KINDS.map((f) => f.kind), ...POINTS_OUTPUT_KINDS]), 'summary'];
}

export function defaultOutputKinds(): string[] {
  return [...SOLVE_OUTPUT_KINDS.filter((f) => f.defaultOn).map((f) => f.kind), 'summary'];
}

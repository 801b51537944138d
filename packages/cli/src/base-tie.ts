/**
 * A base on an unknown point, tied to a CORS in the same run: the base's own file is first solved as a
 * static rover against the CORS (carrier phase when both recorded it, else code), its mark averaged from
 * the fixed epochs (else float, else code: chooseEpochs), and that coordinate, in the CORS coordinate's
 * frame and epoch, becomes the reference of the rover run. The rover so inherits the CORS coordinate; the
 * tie baseline and its precision go into summary.json, and the tie's precision is added to the reference
 * coordinate's own uncertainty.
 */
import type { EcefM, EnuM, EpochSolution, NavData, ReferenceSigma, SessionOptions, WarningSink } from '@refdelta/core';
import { ProcessingError, chooseEpochs, carrierPointFloor, ecefDeltaToEnu, ecefToGeodetic, sigmaRescaleFactor, solveSession, summarisePoint } from '@refdelta/core';
import { openObs as openObsOfFile, type OpenedObs } from './node-io.js';
import { parseCarrierChoice, runCarrierSession } from './carrier-run.js';
import type { ResolvedReference } from './reference-choice.js';
import type { Reporter } from './reporter.js';
import { UsageError } from './usage-error.js';

export interface BaseTie {
  /** The base's ground mark, in the frame of the CORS coordinate. */
  readonly markM: EcefM;
  readonly sigma: ReferenceSigma;
  /** CORS mark to base mark, east/north/up at the CORS (m). */
  readonly baselineEnuM: EnuM;
  readonly lengthM: number;
  readonly epochs: number;
  readonly epochsUsed: number;
  /** Which epochs the mark is averaged from (fixed, fixed+float, code). */
  readonly basis: string;
  readonly corsFiles: readonly string[];
}

export async function tieBaseToCors(
  baseFiles: readonly string[], corsFiles: readonly string[], nav: NavData, cors: ResolvedReference, session: Omit<SessionOptions, 'reference' | 'roverAntenna'>,
  carrierArgs: Record<string, unknown>, rep: Reporter,
  /** Opens the observation files (the caller's, which closes them when its run ends). */
  openObs: (path: string, onWarning: WarningSink) => Promise<OpenedObs> = openObsOfFile,
): Promise<BaseTie> {
  if (baseFiles.length !== 1) throw new UsageError(`--tie-to needs exactly one reference (base) file to tie, got ${baseFiles.length}`);
  const base = await openObs(baseFiles[0], () => {});
  const stations: OpenedObs[] = [];
  for (const p of corsFiles) stations.push(await openObs(p, rep.warn));
  const options: SessionOptions = {
    ...session,
    reference: { position: cors.position, source: cors.source, antenna: stations[0].header.antennaOffset },
    roverAntenna: base.header.antennaOffset,
    reduceToMark: true,
  };
  const choice = parseCarrierChoice({ ...carrierArgs, dynamics: 'static' }, 'solve', base.header, stations[0].header, options);
  const reopen = async () => {
    const again: OpenedObs[] = [];
    for (const p of corsFiles) again.push(await openObs(p, () => {}));
    return { rover: await openObs(baseFiles[0], () => {}), references: again };
  };
  const inputs = { rover: base, references: stations, nav, onWarning: rep.warn };
  try {
    return await tieFromRun(choice.on ? await runCarrierSession(inputs, options, choice) : await solveSession({ ...inputs, reopen }, options), baseFiles[0], corsFiles, cors);
  } catch (e) {
    throw e instanceof ProcessingError ? new ProcessingError(`${tieWords(baseFiles[0], corsFiles)}: ${e.message}`) : e;
  }
}

/**
 * Names the roles of an error of the tie's run: the engine calls its two receivers rover and reference,
 * which in the tie are the base and the CORS.
 */
export function tieWords(baseFile: string, corsFiles: readonly string[]): string {
  return `tying the base ${baseFile} to the CORS ${corsFiles.join(', ')} (in what follows the base is the rover and the CORS the reference)`;
}

async function tieFromRun(run: { epochs: AsyncIterable<EpochSolution> }, baseFile: string, corsFiles: readonly string[], cors: ResolvedReference): Promise<BaseTie> {
  const epochs: { kind: Parameters<typeof chooseEpochs>[0][number]['kind']; ecef: EcefM; tGpsS: number; baselineM?: number; sigmaEnuM?: EnuM; varianceFactor?: number }[] = [];
  let all = 0;
  for await (const s of run.epochs) {
    all++;
    if (!s.position) continue;
    const vf = sigmaRescaleFactor(s.kind, s.quality);
    epochs.push({
      kind: s.kind, ecef: s.position.ecef, tGpsS: s.tagGpsS,
      ...(s.baselineEcef ? { baselineM: Math.hypot(s.baselineEcef.x, s.baselineEcef.y, s.baselineEcef.z) } : {}),
      ...(s.sigmaEnuM ? { sigmaEnuM: s.sigmaEnuM } : {}), ...(vf !== undefined ? { varianceFactor: vf } : {}),
    });
  }
  const { chosen, basis } = chooseEpochs(epochs, 10);
  if (chosen.length === 0 || basis === 'standalone') throw new UsageError(`the base ${baseFile} could not be tied to ${corsFiles.join(', ')}: no differential epoch`);
  const carrier = basis === 'fixed' || basis === 'fixed+float';
  // Float ambiguity errors last through their arcs: a fixed+float tie keeps its float epochs' formal sigma (as points do).
  const p = summarisePoint(chosen, { ...(carrier ? { sigmaFloor: carrierPointFloor(chosen) } : {}), ...(basis === 'fixed+float' ? { formalErrorsPersist: true } : {}) });
  const g = ecefToGeodetic(cors.position.ecef);
  const d = { x: p.meanEcef.x - cors.position.ecef.x, y: p.meanEcef.y - cors.position.ecef.y, z: p.meanEcef.z - cors.position.ecef.z };
  return {
    markM: p.meanEcef,
    sigma: { horizontalM: Math.hypot(p.sigmaMeanEastM, p.sigmaMeanNorthM) / Math.SQRT2, verticalM: p.sigmaMeanUpM },
    baselineEnuM: ecefDeltaToEnu(d, g.latRad, g.lonRad),
    lengthM: Math.hypot(d.x, d.y, d.z),
    epochs: all, epochsUsed: chosen.length, basis, corsFiles,
  };
}

/** The tied base as the rover run's reference coordinate (frame and epoch of the CORS coordinate). */
export function tiedReference(tie: BaseTie, cors: ResolvedReference, baseFile: string): ResolvedReference {
  const e = tie.baselineEnuM;
  return {
    position: { ecef: tie.markM, frame: cors.position.frame },
    source: `${baseFile} tied to ${tie.corsFiles.join(', ')} (${cors.source})`,
    note: `reference mark tied to the CORS in this run (${tie.basis} epochs, ${tie.epochsUsed} of ${tie.epochs}): baseline E/N/U ${e.e.toFixed(3)}/${e.n.toFixed(3)}/${e.u.toFixed(3)} m, length ${tie.lengthM.toFixed(3)} m, sigma horizontal ${tie.sigma.horizontalM.toFixed(3)} m, vertical ${tie.sigma.verticalM.toFixed(3)} m`,
  };
}

/** The tie's part of summary.json. */
export function tieJson(tie: BaseTie): Record<string, unknown> {
  const r = (x: number) => Math.round(x * 10_000) / 10_000;
  return {
    cors_files: [...tie.corsFiles], basis: tie.basis, epochs: tie.epochs, epochs_used: tie.epochsUsed,
    base_mark: { x_m: r(tie.markM.x), y_m: r(tie.markM.y), z_m: r(tie.markM.z) },
    baseline_east_m: r(tie.baselineEnuM.e), baseline_north_m: r(tie.baselineEnuM.n), baseline_up_m: r(tie.baselineEnuM.u), baseline_length_m: r(tie.lengthM),
    sigma_horizontal_m: r(tie.sigma.horizontalM), sigma_vertical_m: r(tie.sigma.verticalM),
  };
}

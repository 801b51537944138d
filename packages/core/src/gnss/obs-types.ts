/**
 * The observation data model shared by the readers, the writer, the simulator and the engine.
 * Observation codes are RINEX 3 three-character codes ('C1C', 'L1C', 'D1C', 'S1C', 'C1W', 'C2W', ...);
 * RINEX 2 two-character codes are mapped to them on reading (see obs-codes.ts).
 */
import type { EcefM, GnssSystem, SatId } from './types.js';
import type { TimeSystem } from '../time/index.js';

export interface AntennaOffset {
  /** ANTENNA: DELTA H/E/N: height of the antenna reference point above the marker, and east/north eccentricities (m). */
  readonly heightM: number;
  readonly eastM: number;
  readonly northM: number;
}

export interface ObsHeader {
  /** e.g. 2.11, 3.03, 4.0 */
  readonly version: number;
  /** 'O' */
  readonly fileType: string;
  /** Satellite system field of the first header line: 'G', 'R', 'E', 'M' (mixed)... */
  readonly systemField: string;
  readonly markerName: string;
  readonly markerNumber: string;
  readonly receiverType: string;
  readonly receiverNumber: string;
  readonly antennaType: string;
  readonly antennaNumber: string;
  /** APPROX POSITION XYZ, null when absent or all zero. */
  readonly approxPosition: EcefM | null;
  readonly antennaOffset: AntennaOffset;
  /** Observation codes per system, in file order, as RINEX 3 codes (RINEX 2 codes mapped). */
  readonly obsCodes: Readonly<Partial<Record<GnssSystem, readonly string[]>>>;
  /** Original codes as written in the file (RINEX 2: 'C1','P2'...; RINEX 3 codes as is). */
  readonly fileObsCodes: Readonly<Partial<Record<GnssSystem, readonly string[]>>>;
  readonly intervalS: number | null;
  /** TIME OF FIRST OBS in GPS seconds (converted from its time system), null when absent. */
  readonly firstObsGpsS: number | null;
  readonly lastObsGpsS: number | null;
  /** Time system of epoch tags (from TIME OF FIRST OBS; default by system per RINEX). */
  readonly timeSystem: TimeSystem;
  /** GLONASS SLOT / FRQ #: slot -> frequency channel k (-7..+6). */
  readonly glonassChannels: ReadonlyMap<number, number>;
  /** GLONASS COD/PHS/BIS: code -> bias (m). */
  readonly glonassCodePhaseBias: Readonly<Record<string, number>>;
  /** SYS / PHASE SHIFT: system -> code -> cycles. */
  readonly phaseShifts: Readonly<Partial<Record<GnssSystem, Readonly<Record<string, number>>>>>;
  /** SYS / SCALE FACTOR: system -> code -> factor (values in the file were multiplied by it; the reader divides). */
  readonly scaleFactors: Readonly<Partial<Record<GnssSystem, Readonly<Record<string, number>>>>>;
  /** RCV CLOCK OFFS APPL: true when epochs/observations were corrected by the receiver clock offset. */
  readonly clockOffsetApplied: boolean;
  /** LEAP SECONDS (GPS - UTC) when given. */
  readonly leapSeconds: number | null;
  /** Every header line kept verbatim (label -> contents), for inspection and writing back. */
  readonly comments: readonly string[];
  /** Number of header lines (the first epoch record starts on line headerLines + 1). */
  readonly headerLines: number;
  /** REC # / TYPE / VERS: firmware version (third field). Optional: added by the obs reader. */
  readonly receiverVersion?: string;
  /**
   * Header lines (80 columns, label included) of records the model does not interpret (PGM / RUN BY / DATE,
   * OBSERVER / AGENCY, MARKER TYPE, SIGNAL STRENGTH UNIT...), in file order, for writing back. Optional.
   */
  readonly otherRecords?: readonly string[];
}

/** Loss of lock indicator bits, decoded (RINEX 2.11 5.1 / RINEX 3.05 5.3 table). */
export const LLI_LOST_LOCK = 1;
/** RINEX 2: opposite wavelength factor; RINEX 3: half-cycle ambiguity / slip possible. */
export const LLI_HALF_CYCLE = 2;
/** RINEX 2.11: anti-spoofing on; RINEX 3.x: BOC tracking of an MBOC signal (Galileo). */
export const LLI_AS_OR_BOC = 4;

/** One satellite's observations at one epoch, aligned with the system's code list. */
export interface SatObservations {
  readonly sat: SatId;
  /** The system's RINEX 3 codes (same array object as header.obsCodes[system]: shared, not copied). */
  readonly codes: readonly string[];
  /** Values aligned with `codes`; NaN when blank/absent. Pseudorange m, phase cycles, Doppler Hz, strength dB-Hz or RINEX 2 digit scale (see `strengthUnit`). */
  readonly values: Float64Array;
  /** LLI per code, 0 when blank. */
  readonly lli: Uint8Array;
  /** Signal strength indicator digit 1-9 per code, 0 when blank. */
  readonly ssi: Uint8Array;
}

/** Header records met inside the data (epoch flags 2-5): applied from that epoch on. */
export interface HeaderEvent {
  readonly kind: 'start-moving' | 'new-occupation' | 'header-info' | 'external-event' | 'power-failure';
  readonly markerName?: string;
  readonly markerNumber?: string;
  readonly antennaOffset?: AntennaOffset;
  readonly approxPosition?: EcefM;
  readonly comments: readonly string[];
}

export interface ObsEpoch {
  /** Epoch tag converted to GPS seconds since the GPS epoch (receiver time as tagged; not corrected). */
  readonly tagGpsS: number;
  /** Epoch flag 0-6. */
  readonly flag: number;
  /**
   * True when the file left the epoch fields blank (allowed for event flags 2-5, RINEX 2.11 / 3.05 epoch
   * record): `tagGpsS` then repeats the previous epoch's tag (NaN before the first). Optional.
   */
  readonly tagWasBlank?: boolean;
  /** Receiver clock offset (s) when the file gives it. */
  readonly receiverClockOffsetS: number | null;
  /** 1-based line of the epoch record. */
  readonly line: number;
  /** Observations (flags 0, 1, 6). Flag 6 carries cycle-slip records: same layout. */
  readonly sats: readonly SatObservations[];
  /** Header records or events that take effect from this epoch (flags 2-5). */
  readonly event: HeaderEvent | null;
}

/** A parsed observation stream: the header, then epochs one at a time (bounded memory). */
export interface ObsStream {
  readonly file: string;
  readonly header: ObsHeader;
  readonly epochs: AsyncIterable<ObsEpoch>;
  /**
   * Gives the reading up: the input is let go (a file behind it closed now) and epochs not yet handed
   * out never are. A stream read to its end, or left by break, lets its input go by itself; a stream
   * whose epochs are never read (a header probe) needs this. Optional: a stream holding nothing to let
   * go may leave it out.
   */
  readonly close?: () => Promise<void>;
}

/**
 * Types of the invented demo world. Everything here is plain data: no database,
 * no framework imports, so the seed runner, tests and scripts can share it.
 */

/** Emission-line ids of the public API (docs/model.md §Lines). */
export type LineId =
  | 'Ha'
  | 'Hb'
  | 'Hg'
  | 'OIII'
  | 'OIII-496'
  | 'NII-658'
  | 'NII-655'
  | 'SII-671'
  | 'SII-673'
  | 'HeII'
  | 'OI'
  | 'ArIII'
  | 'OII';

export type Role = 'contributor' | 'moderator' | 'admin';
export type Licence = 'CC-BY-4.0' | 'CC0-1.0';
export type Instrument = 'spectrophotometer' | 'spectrograph' | 'monochromator' | 'other';
export type Beam = 'collimated' | 'converging';
export type Polarization = 'unpolarized' | 's' | 'p';
export type CurveStatus = 'verified' | 'submitted' | 'changes_requested';

export interface DemoPerson {
  email: string;
  name: string;
  role: Role;
}

export interface DemoMaker {
  name: string;
  description: string;
}

export interface DemoLab {
  name: string;
  place: string;
  kind: 'observatory' | 'test lab' | 'university lab' | 'makerspace';
  description: string;
  /** Instruments the lab is imagined to own (used to pick a plausible method). */
  instruments: Instrument[];
  /** True when the lab has a rotation stage and a collimated beam (multi-angle sets). */
  angleStage: boolean;
}

export interface DemoOptic {
  name: string;
  description: string;
  apertureMm: number;
  focalLengthMm: number;
  obstructionMm: number;
  /** focalLengthMm / apertureMm */
  fNumber: number;
  /** obstructionMm / apertureMm */
  obstruction: number;
  fieldAngleDeg: number;
}

export interface CurvePoints {
  wavelengthNm: number[];
  transmission: number[];
}

export interface DemoMethod {
  instrument: Instrument;
  resolutionNm: number;
  beam: Beam;
  beamFNumber?: number;
  aoiDeg: number;
  temperatureC?: number;
  polarization?: Polarization;
  /** declared coating type: hard (sputtered), soft (evaporated) or unknown */
  coating?: import('@/lib/engine/temperature').Coating;
  /** ISO date, YYYY-MM-DD */
  measuredOn: string;
  lab: string;
}

/** One passband of the generator's closed form (see multiCavityPassband). */
export interface PassbandBand {
  cwlNm: number;
  fwhmNm: number;
  peakT: number;
  /** number of cavities m: the edge steepness exponent is 2m */
  cavities: number;
}

/** What the generator really used for a curve: the ground truth tests and demos can check against. */
export interface GeneratedTruth {
  /** passbands of the physical unit at normal incidence */
  bands: PassbandBand[];
  /** the same passbands as seen at the measurement AOI (cwl and fwhm scaled by s(θ)) */
  bandsAtAoi: PassbandBand[];
  /** effective index of the unit (every unit has one; sets expose it as trueNEff) */
  nEff: number;
  /** relative in-band ripple amplitude */
  rippleAmplitude: number;
  ripplePeriodNm: number;
  /** out-of-band blocking floor (absolute transmission) */
  blockingFloor: number;
  /** standard deviation of the added Gaussian instrument noise (absolute) */
  noiseSigma: number;
  /** sampling step of the measurement, nm */
  stepNm: number;
  /** a deliberate departure from the catalogue, for the automatic checks to notice */
  anomaly?: string;
}

export interface DemoCurve {
  /** stable key: the same for every seed */
  key: string;
  /** make and model as a contributor would write it */
  label: string;
  makerName: string;
  lines: LineId[];
  /**
   * Catalogue CWL at normal incidence as the maker quotes it. For pre-shifted
   * models it already includes the pre-shift (nominal = line + declared pre-shift).
   * For dual-band curves these are the first (primary) passband's values.
   */
  nominalCwlNm: number;
  nominalFwhmNm: number;
  declaredPreShiftNm?: number;
  serial: string;
  sizeMm: number;
  notes: string;
  licence: Licence;
  contributorEmail: string;
  method: DemoMethod;
  /** set key when this curve is one angle of a multi-angle curve set */
  setKey?: string;
  /** the effective index used to generate the set (sets only) */
  trueNEff?: number;
  /** the dCWL/dT used to generate a multi-temperature set, nm/°C */
  trueTempCoeffNmPerC?: number;
  /** the s and p indices used to generate a polarised set */
  trueNEffPolarised?: { s: number; p: number };
  status: CurveStatus;
  points: CurvePoints;
  generated: GeneratedTruth;
}

/** One physical unit measured at several angles of incidence. */
export interface DemoCurveSet {
  key: string;
  label: string;
  makerName: string;
  serial: string;
  contributorEmail: string;
  trueNEff: number;
  /** primary passband CWL at normal incidence (truth) */
  cwl0Nm: number;
  aoisDeg: number[];
  /** curve keys in AOI order */
  curveKeys: string[];
}

export interface DemoReview {
  curveKey: string;
  moderatorEmail: string;
  decision: 'verify' | 'request_changes';
  /** public note, one short sentence */
  note: string;
  /** ISO date after the curve's measuredOn */
  reviewedOn: string;
}

export interface DemoWorld {
  seed: number;
  notice: string;
  people: DemoPerson[];
  makers: DemoMaker[];
  labs: DemoLab[];
  optics: DemoOptic[];
  curves: DemoCurve[];
  sets: DemoCurveSet[];
  reviews: DemoReview[];
}

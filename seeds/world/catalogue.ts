/**
 * The fixed, hand-written part of the demo world: invented people, makers,
 * labs, example optics and the filter catalogue the curves are generated from.
 * Every name here is made up (demo).
 */
import type { Coating } from '@/lib/engine/temperature';
import type { DemoLab, DemoMaker, DemoOptic, DemoPerson, Instrument, LineId } from './types';

export const DEMO_NOTICE = 'Demo data: invented makers, places, people and generated curves.';

/** Standard air wavelengths (nm) of the catalogued lines, docs/model.md §Lines. */
export const LINE_AIR_NM: Readonly<Record<LineId, number>> = {
  Ha: 656.28,
  Hb: 486.13,
  Hg: 434.05,
  OIII: 500.68,
  'OIII-496': 495.89,
  'NII-658': 658.35,
  'NII-655': 654.8,
  'SII-671': 671.64,
  'SII-673': 673.08,
  HeII: 468.57,
  OI: 630.03,
  ArIII: 713.58,
  OII: 372.6,
};

export const DEMO_EMAIL_DOMAIN = 'bandcone.test';

// ---------------------------------------------------------------- people
export const PEOPLE: readonly DemoPerson[] = [
  { email: 'contributor@bandcone.test', name: 'Wren Tallowmere', role: 'contributor' },
  { email: 'contributor2@bandcone.test', name: 'Idris Vantcombe', role: 'contributor' },
  { email: 'moderator@bandcone.test', name: 'Maren Oakhollow', role: 'moderator' },
  { email: 'moderator2@bandcone.test', name: 'Teodor Brisk-Lanning', role: 'moderator' },
  { email: 'admin@bandcone.test', name: 'Sable Quarrington', role: 'admin' },
  { email: 'ottoline.farrowby@bandcone.test', name: 'Ottoline Farrowby', role: 'contributor' },
  { email: 'juno.halberstock@bandcone.test', name: 'Juno Halberstock', role: 'contributor' },
  { email: 'perrin.ashgrove-kell@bandcone.test', name: 'Perrin Ashgrove-Kell', role: 'contributor' },
  { email: 'bexley.morrandt@bandcone.test', name: 'Bexley Morrandt', role: 'contributor' },
  { email: 'nadia.quillfeather@bandcone.test', name: 'Nadia Quillfeather', role: 'contributor' },
];

export const MODERATOR_EMAILS = ['moderator@bandcone.test', 'moderator2@bandcone.test'] as const;

// ---------------------------------------------------------------- makers
export const MAKERS: readonly DemoMaker[] = [
  { name: 'Vantrell Thinfilm Works', description: 'Invented maker (demo) of narrow hard-coated filters in mounted 1.25" and 2" cells.' },
  { name: 'Orsenby Coatings', description: 'Invented coating house (demo) with a line of mid-width emission filters.' },
  { name: 'Maelkirk Optical', description: 'Invented maker (demo) of 5 nm filters and a wide Hα + [N II] filter.' },
  { name: 'Yarrowmane Photonics', description: 'Invented maker (demo) of dual-band filters for one-shot-colour cameras.' },
  { name: 'Tessaly & Hume Interference', description: 'Invented maker (demo) of very narrow four-cavity filters, pre-shifted for fast optics.' },
  { name: 'Ostrowen Glassworks', description: 'Invented maker (demo) of wide, high-transmission visual filters.' },
  { name: 'Brisquenne Optics', description: 'Invented maker (demo) of filters pre-shifted for fast obstructed astrographs.' },
];

// ---------------------------------------------------------------- labs
export const LABS: readonly DemoLab[] = [
  {
    name: 'Lowenfold Optical Test Bench (demo)',
    place: 'Lowenfold, an invented market town',
    kind: 'test lab',
    description: 'A small invented test lab with a grating spectrophotometer, a collimated beam and a rotation stage.',
    instruments: ['spectrophotometer', 'monochromator'],
    angleStage: true,
  },
  {
    name: 'Vessary University Photonics Lab (demo)',
    place: 'Vessary, an invented university city',
    kind: 'university lab',
    description: 'An invented teaching lab with a double-beam spectrophotometer and a motorised tilt mount.',
    instruments: ['spectrophotometer'],
    angleStage: true,
  },
  {
    name: 'Cragmere Hill Observatory (demo)',
    place: 'Cragmere Hill, an invented upland',
    kind: 'observatory',
    description: 'An invented club observatory measuring filters with a slit spectrograph and a lamp box.',
    instruments: ['spectrograph'],
    angleStage: false,
  },
  {
    name: "Saltmarrow Amateur Astronomers' Dome (demo)",
    place: 'Saltmarrow, an invented coastal village',
    kind: 'observatory',
    description: 'An invented amateur dome with a small spectrograph and a scanning monochromator.',
    instruments: ['spectrograph', 'monochromator'],
    angleStage: false,
  },
  {
    name: 'Thrennock Ridge Station (demo)',
    place: 'Thrennock Ridge, an invented hill station',
    kind: 'observatory',
    description: 'An invented remote station with a fibre-fed spectrograph.',
    instruments: ['spectrograph'],
    angleStage: false,
  },
  {
    name: 'Pennick Yard Makerspace (demo)',
    place: 'Pennick Yard, an invented workshop quarter',
    kind: 'makerspace',
    description: 'An invented makerspace bench: a stepped monochromator and a photodiode, plus a home-built LED sweep.',
    instruments: ['monochromator', 'other'],
    angleStage: false,
  },
];

/** Where each contributor usually measures. */
export const HOME_LAB: Readonly<Record<string, string>> = {
  'contributor@bandcone.test': 'Lowenfold Optical Test Bench (demo)',
  'contributor2@bandcone.test': 'Vessary University Photonics Lab (demo)',
  'perrin.ashgrove-kell@bandcone.test': 'Vessary University Photonics Lab (demo)',
  'ottoline.farrowby@bandcone.test': "Saltmarrow Amateur Astronomers' Dome (demo)",
  'juno.halberstock@bandcone.test': 'Thrennock Ridge Station (demo)',
  'bexley.morrandt@bandcone.test': 'Pennick Yard Makerspace (demo)',
  'nadia.quillfeather@bandcone.test': 'Cragmere Hill Observatory (demo)',
};

// ---------------------------------------------------------------- optics
function optic(
  name: string,
  description: string,
  apertureMm: number,
  focalLengthMm: number,
  obstructionMm: number,
  fieldAngleDeg: number,
): DemoOptic {
  return {
    name,
    description,
    apertureMm,
    focalLengthMm,
    obstructionMm,
    fNumber: Math.round((focalLengthMm / apertureMm) * 1e4) / 1e4,
    obstruction: Math.round((obstructionMm / apertureMm) * 1e4) / 1e4,
    fieldAngleDeg,
  };
}

export const OPTICS: readonly DemoOptic[] = [
  optic('Obstructed astrograph f/2.5', 'A generic f/2.5 astrograph with a 0.36 central obstruction; chief ray reaches 6° at the field edge (demo).', 200, 500, 72, 6),
  optic('f/1.6 camera lens', 'A generic fast camera lens with the filter behind the rear element; unobstructed, 12° chief ray at the field edge (demo).', 50, 80, 0, 12),
  optic('Corrector-plate system, camera at focus', 'A generic f/1.8 corrector-plate system, 240 mm aperture, with the camera body in the beam at focus: 0.42 obstruction (demo).', 240, 432, 100.8, 3),
  optic('Unobstructed refractor f/3.6', 'A generic f/3.6 refractor with a flattening reducer; unobstructed (demo).', 90, 324, 0, 4),
  optic('Reflector f/3.2 with coma corrector', 'A generic f/3.2 reflector with a 0.28 secondary and a coma corrector (demo).', 250, 800, 70, 5),
  optic('Reflector f/5', 'A generic f/5 reflector with a 0.25 secondary and a field corrector (demo).', 200, 1000, 50, 2),
  optic('Cassegrain f/8.5', 'A generic slow f/8.5 Cassegrain with a 0.30 central obstruction; a near-collimated case for comparison (demo).', 250, 2125, 75, 1),
];

// ---------------------------------------------------------------- filter catalogue
export interface UnitSpec {
  status?: 'verified' | 'submitted' | 'changes_requested';
  /** measured at AOI 0, 4, 8, 12, 16° as a curve set */
  angleSet?: boolean;
  /** force the contributor */
  contributorEmail?: string;
  /** deliberate CWL offset from the catalogue (nm), beyond the ordinary spread */
  cwlOffsetNm?: number;
  anomaly?: string;
  /** sample 400–800 nm at 0.5 nm */
  wideScan?: boolean;
  /** measurement AOI for a single curve (default 0) */
  aoiDeg?: number;
  /** measured at normal incidence at several temperatures (TEMP_SET_C) in a heated holder: the set fits dCWL/dT */
  tempSet?: boolean;
  /** measured at POLARISED_SET_AOIS_DEG in s and in p light: the set fits separate s and p indices */
  polarisedSet?: boolean;
  /** override the declared resolution (nm) */
  resolutionNm?: number;
  /** moderator note for a curve sent back (changes_requested) */
  changesNote?: string;
}

export interface CatalogueBand {
  /** catalogue CWL at normal incidence (includes the pre-shift when there is one) */
  cwlNm: number;
  fwhmNm: number;
  peakT: number;
}

export interface FilterModel {
  /** slug used in stable curve keys */
  id: string;
  makerName: string;
  label: string;
  lines: LineId[];
  /** first band is the primary one; its values are the curve's nominal ones */
  bands: CatalogueBand[];
  declaredPreShiftNm?: number;
  cavities: number;
  sizesMm: number[];
  coating: string;
  /** The coating type declared on upload (sets the default dCWL/dT): mostly hard, a few soft, some not known. */
  coatingType: Coating;
  serialPrefix: string;
  units: UnitSpec[];
}

const plain = (n: number): UnitSpec[] => Array.from({ length: n }, () => ({}));

export const FILTER_MODELS: readonly FilterModel[] = [
  // --- Vantrell Thinfilm Works
  {
    id: 'vantrell-quillon-ha-2-5',
    makerName: 'Vantrell Thinfilm Works',
    label: 'Vantrell Quillon Hα 2.5nm',
    lines: ['Ha'],
    bands: [{ cwlNm: 656.3, fwhmNm: 2.5, peakT: 0.9 }],
    cavities: 3,
    sizesMm: [31.75, 50.8],
    coating: 'hard oxide multilayer, ion-assisted',
    coatingType: 'hard',
    serialPrefix: 'VQN',
    units: [{}, { angleSet: true, contributorEmail: 'contributor@bandcone.test' }, {}, {}, {}],
  },
  {
    id: 'vantrell-quillon-oiii-2-5',
    makerName: 'Vantrell Thinfilm Works',
    label: 'Vantrell Quillon OIII 2.5nm',
    lines: ['OIII'],
    bands: [{ cwlNm: 500.7, fwhmNm: 2.5, peakT: 0.88 }],
    cavities: 3,
    sizesMm: [31.75, 50.8],
    coating: 'hard oxide multilayer, ion-assisted',
    coatingType: 'hard',
    serialPrefix: 'VQN',
    units: [
      ...plain(4),
      {
        status: 'submitted',
        contributorEmail: 'contributor2@bandcone.test',
        cwlOffsetNm: 0.8,
        anomaly: 'unit CWL about 0.8 nm red of the catalogue value',
      },
    ],
  },
  {
    id: 'vantrell-quillon-sii-2-5',
    makerName: 'Vantrell Thinfilm Works',
    label: 'Vantrell Quillon SII 2.5nm',
    lines: ['SII-671', 'SII-673'],
    bands: [{ cwlNm: 672.0, fwhmNm: 2.5, peakT: 0.86 }],
    cavities: 3,
    sizesMm: [31.75, 50.8],
    coating: 'hard oxide multilayer, ion-assisted',
    coatingType: 'hard',
    serialPrefix: 'VQN',
    units: plain(3),
  },
  {
    id: 'vantrell-quillon-redset-ha-2-5',
    makerName: 'Vantrell Thinfilm Works',
    label: 'Vantrell Quillon Redset Hα 2.5nm',
    lines: ['Ha'],
    bands: [{ cwlNm: 657.2, fwhmNm: 2.5, peakT: 0.9 }],
    declaredPreShiftNm: 0.9,
    cavities: 3,
    sizesMm: [36, 50.8],
    coating: 'hard oxide multilayer, ion-assisted',
    coatingType: 'hard',
    serialPrefix: 'VQR',
    units: plain(3),
  },
  // --- Orsenby Coatings
  {
    id: 'orsenby-cindral-ha-7',
    makerName: 'Orsenby Coatings',
    label: 'Orsenby Cindral Hα 7 nm',
    lines: ['Ha'],
    bands: [{ cwlNm: 656.3, fwhmNm: 7, peakT: 0.93 }],
    cavities: 2,
    sizesMm: [31.75, 50.8],
    coating: 'evaporated dielectric stack with a cemented cover',
    coatingType: 'soft',
    serialPrefix: 'ORQ',
    units: [
      {},
      { cwlOffsetNm: 0.8, anomaly: 'unit CWL about 0.8 nm red of the catalogue value' },
      {},
      {},
      {
        status: 'changes_requested',
        contributorEmail: 'contributor2@bandcone.test',
        resolutionNm: 2.5,
        changesNote: 'The declared 2.5 nm resolution is too coarse for a 7 nm passband; please correct the method or re-measure.',
      },
    ],
  },
  {
    id: 'orsenby-cindral-hb-9',
    makerName: 'Orsenby Coatings',
    label: 'Orsenby Cindral Hβ 9 nm',
    lines: ['Hb'],
    bands: [{ cwlNm: 486.1, fwhmNm: 9, peakT: 0.91 }],
    cavities: 2,
    sizesMm: [31.75, 50.8],
    coating: 'evaporated dielectric stack with a cemented cover',
    coatingType: 'soft',
    serialPrefix: 'ORQ',
    units: plain(2),
  },
  {
    id: 'orsenby-cindral-oiii-7',
    makerName: 'Orsenby Coatings',
    label: 'Orsenby Cindral OIII 7 nm',
    lines: ['OIII'],
    bands: [{ cwlNm: 500.7, fwhmNm: 7, peakT: 0.92 }],
    cavities: 2,
    sizesMm: [31.75, 50.8],
    coating: 'evaporated dielectric stack with a cemented cover',
    coatingType: 'soft',
    serialPrefix: 'ORQ',
    units: [{}, {}, { angleSet: true, contributorEmail: 'contributor2@bandcone.test' }, {}, { tempSet: true, contributorEmail: 'contributor2@bandcone.test' }],
  },
  // --- Maelkirk Optical
  {
    id: 'maelkirk-tarn-ha-5',
    makerName: 'Maelkirk Optical',
    label: 'Maelkirk Tarn Hα 5nm',
    lines: ['Ha'],
    bands: [{ cwlNm: 656.3, fwhmNm: 5, peakT: 0.89 }],
    cavities: 3,
    sizesMm: [31.75, 36, 50.8],
    coating: 'sputtered oxide stack',
    coatingType: 'hard',
    serialPrefix: 'MQT',
    units: plain(3),
  },
  {
    id: 'maelkirk-tarn-hb-5',
    makerName: 'Maelkirk Optical',
    label: 'Maelkirk Tarn Hβ 5nm',
    lines: ['Hb'],
    bands: [{ cwlNm: 486.1, fwhmNm: 5, peakT: 0.86 }],
    cavities: 3,
    sizesMm: [31.75, 36, 50.8],
    coating: 'sputtered oxide stack',
    coatingType: 'hard',
    serialPrefix: 'MQT',
    units: [{}, { cwlOffsetNm: -0.9, anomaly: 'unit CWL about 0.9 nm blue of the catalogue value' }, {}],
  },
  {
    id: 'maelkirk-tarn-sii-5',
    makerName: 'Maelkirk Optical',
    label: 'Maelkirk Tarn SII 5nm',
    lines: ['SII-671', 'SII-673'],
    bands: [{ cwlNm: 672.4, fwhmNm: 5, peakT: 0.88 }],
    cavities: 3,
    sizesMm: [31.75, 36, 50.8],
    coating: 'sputtered oxide stack',
    coatingType: 'hard',
    serialPrefix: 'MQT',
    units: [{ angleSet: true, contributorEmail: 'perrin.ashgrove-kell@bandcone.test' }, {}, {}],
  },
  {
    id: 'maelkirk-wendle-ha-nii-11',
    makerName: 'Maelkirk Optical',
    label: 'Maelkirk Wendle Hα+NII 11nm',
    lines: ['Ha', 'NII-658', 'NII-655'],
    bands: [{ cwlNm: 656.5, fwhmNm: 11, peakT: 0.95 }],
    cavities: 2,
    sizesMm: [31.75, 50.8],
    coating: 'sputtered oxide stack, wide two-cavity design',
    coatingType: 'hard',
    serialPrefix: 'MQW',
    units: [{}, { wideScan: true }],
  },
  {
    id: 'maelkirk-tarn-hg-5',
    makerName: 'Maelkirk Optical',
    label: 'Maelkirk Tarn Hγ 5nm',
    lines: ['Hg'],
    bands: [{ cwlNm: 434.1, fwhmNm: 5, peakT: 0.82 }],
    cavities: 3,
    sizesMm: [31.75],
    coating: 'sputtered oxide stack',
    coatingType: 'hard',
    serialPrefix: 'MQT',
    units: [{ status: 'submitted', contributorEmail: 'juno.halberstock@bandcone.test' }],
  },
  // --- Yarrowmane Photonics (dual band)
  {
    id: 'yarrowmane-bivane-ha-oiii',
    makerName: 'Yarrowmane Photonics',
    label: 'Yarrowmane Bivane Hα/OIII',
    lines: ['Ha', 'OIII'],
    bands: [
      { cwlNm: 656.3, fwhmNm: 7, peakT: 0.93 },
      { cwlNm: 500.7, fwhmNm: 7, peakT: 0.85 },
    ],
    cavities: 2,
    sizesMm: [31.75, 50.8],
    coating: 'dual-band dielectric coating',
    coatingType: 'unknown',
    serialPrefix: 'YBV',
    units: [{}, { angleSet: true, contributorEmail: 'contributor@bandcone.test' }, { wideScan: true }, {}],
  },
  {
    id: 'yarrowmane-bivane-sii-oiii',
    makerName: 'Yarrowmane Photonics',
    label: 'Yarrowmane Bivane SII/OIII',
    lines: ['SII-671', 'SII-673', 'OIII'],
    bands: [
      { cwlNm: 672.4, fwhmNm: 7, peakT: 0.91 },
      { cwlNm: 500.7, fwhmNm: 7, peakT: 0.84 },
    ],
    cavities: 2,
    sizesMm: [31.75, 50.8],
    coating: 'dual-band dielectric coating',
    coatingType: 'unknown',
    serialPrefix: 'YBV',
    units: [{}, { wideScan: true }, { status: 'submitted', contributorEmail: 'bexley.morrandt@bandcone.test' }],
  },
  {
    id: 'yarrowmane-bivane-reddle-ha-oiii',
    makerName: 'Yarrowmane Photonics',
    label: 'Yarrowmane Bivane Reddle Hα/OIII',
    lines: ['Ha', 'OIII'],
    bands: [
      { cwlNm: 657.5, fwhmNm: 5.5, peakT: 0.92 },
      { cwlNm: 501.6, fwhmNm: 5.5, peakT: 0.85 },
    ],
    declaredPreShiftNm: 1.2,
    cavities: 3,
    sizesMm: [50.8],
    coating: 'dual-band dielectric coating',
    coatingType: 'unknown',
    serialPrefix: 'YBQ',
    units: plain(3),
  },
  // --- Tessaly & Hume Interference (very narrow)
  {
    id: 'tessaly-hume-corvelle-ha-2-8',
    makerName: 'Tessaly & Hume Interference',
    label: 'Tessaly & Hume Corvelle Hα 2.8nm',
    lines: ['Ha'],
    bands: [{ cwlNm: 656.9, fwhmNm: 2.8, peakT: 0.87 }],
    declaredPreShiftNm: 0.6,
    cavities: 4,
    sizesMm: [36, 50],
    coating: 'four-cavity hard-coated stack',
    coatingType: 'hard',
    serialPrefix: 'TQH',
    units: [
      ...plain(3),
      {
        status: 'changes_requested',
        contributorEmail: 'contributor@bandcone.test',
        cwlOffsetNm: -0.62,
        anomaly: 'declared pre-shift, but the unit sits at the line wavelength',
        changesNote: 'The label declares a 0.6 nm pre-shift but this unit peaks at the line itself; please check the label and serial.',
      },
    ],
  },
  {
    id: 'tessaly-hume-corvelle-oiii-2-8',
    makerName: 'Tessaly & Hume Interference',
    label: 'Tessaly & Hume Corvelle OIII 2.8nm',
    lines: ['OIII'],
    bands: [{ cwlNm: 501.1, fwhmNm: 2.8, peakT: 0.85 }],
    declaredPreShiftNm: 0.4,
    cavities: 4,
    sizesMm: [36, 50],
    coating: 'four-cavity hard-coated stack',
    coatingType: 'hard',
    serialPrefix: 'TQH',
    units: plain(2),
  },
  {
    id: 'tessaly-hume-corvelle-hb-3-8',
    makerName: 'Tessaly & Hume Interference',
    label: 'Tessaly & Hume Corvelle Hβ 3.8nm',
    lines: ['Hb'],
    bands: [{ cwlNm: 486.1, fwhmNm: 3.8, peakT: 0.84 }],
    cavities: 3,
    sizesMm: [36, 50],
    coating: 'three-cavity hard-coated stack',
    coatingType: 'hard',
    serialPrefix: 'TQH',
    units: [{}, { angleSet: true, contributorEmail: 'contributor2@bandcone.test' }, {}, { polarisedSet: true, contributorEmail: 'contributor@bandcone.test' }],
  },
  // --- Ostrowen Glassworks (wide)
  {
    id: 'ostrowen-wideleaf-oiii-10',
    makerName: 'Ostrowen Glassworks',
    label: 'Ostrowen Wideleaf OIII 10nm',
    lines: ['OIII', 'OIII-496'],
    bands: [{ cwlNm: 498.8, fwhmNm: 10, peakT: 0.95 }],
    cavities: 2,
    sizesMm: [31.75, 50.8],
    coating: 'wide two-cavity stack, multicoated back face',
    coatingType: 'unknown',
    serialPrefix: 'OWQ',
    units: [
      { wideScan: true },
      { wideScan: true },
      {},
      { status: 'submitted', contributorEmail: 'ottoline.farrowby@bandcone.test', wideScan: true },
    ],
  },
  {
    id: 'ostrowen-wideleaf-ha-12',
    makerName: 'Ostrowen Glassworks',
    label: 'Ostrowen Wideleaf Hα 12nm',
    lines: ['Ha', 'NII-658', 'NII-655'],
    bands: [{ cwlNm: 656.5, fwhmNm: 12, peakT: 0.95 }],
    cavities: 2,
    sizesMm: [31.75, 50.8],
    coating: 'wide two-cavity stack, multicoated back face',
    coatingType: 'unknown',
    serialPrefix: 'OWQ',
    units: [{}, { aoiDeg: 5 }],
  },
  {
    id: 'ostrowen-wideleaf-heii-9',
    makerName: 'Ostrowen Glassworks',
    label: 'Ostrowen Wideleaf He II 9nm',
    lines: ['HeII'],
    bands: [{ cwlNm: 468.6, fwhmNm: 9, peakT: 0.9 }],
    cavities: 2,
    sizesMm: [31.75],
    coating: 'wide two-cavity stack, multicoated back face',
    coatingType: 'unknown',
    serialPrefix: 'OWQ',
    units: plain(1),
  },
  // --- Brisquenne Optics (pre-shifted for fast optics)
  {
    id: 'brisquenne-leewing-ha-4-5',
    makerName: 'Brisquenne Optics',
    label: 'Brisquenne Leewing Hα 4.5nm',
    lines: ['Ha'],
    bands: [{ cwlNm: 657.8, fwhmNm: 4.5, peakT: 0.9 }],
    declaredPreShiftNm: 1.5,
    cavities: 3,
    sizesMm: [36, 50.8],
    coating: 'ion-beam sputtered stack, blackened edge',
    coatingType: 'hard',
    serialPrefix: 'BQL',
    units: [{}, {}, { angleSet: true, contributorEmail: 'perrin.ashgrove-kell@bandcone.test' }, { aoiDeg: 7 }, { tempSet: true, contributorEmail: 'perrin.ashgrove-kell@bandcone.test' }],
  },
  {
    id: 'brisquenne-leewing-oiii-4-5',
    makerName: 'Brisquenne Optics',
    label: 'Brisquenne Leewing OIII 4.5nm',
    lines: ['OIII'],
    bands: [{ cwlNm: 501.7, fwhmNm: 4.5, peakT: 0.88 }],
    declaredPreShiftNm: 1.0,
    cavities: 3,
    sizesMm: [36, 50.8],
    coating: 'ion-beam sputtered stack, blackened edge',
    coatingType: 'hard',
    serialPrefix: 'BQL',
    units: plain(3),
  },
  {
    id: 'brisquenne-leewing-sii-4-5',
    makerName: 'Brisquenne Optics',
    label: 'Brisquenne Leewing SII 4.5nm',
    lines: ['SII-671', 'SII-673'],
    bands: [{ cwlNm: 673.5, fwhmNm: 4.5, peakT: 0.87 }],
    declaredPreShiftNm: 1.1,
    cavities: 3,
    sizesMm: [36, 50.8],
    coating: 'ion-beam sputtered stack, blackened edge',
    coatingType: 'hard',
    serialPrefix: 'BQL',
    units: [{}, {}, { status: 'submitted', contributorEmail: 'nadia.quillfeather@bandcone.test' }],
  },
  {
    id: 'brisquenne-oi-6-5',
    makerName: 'Brisquenne Optics',
    label: 'Brisquenne OI 6.5nm',
    lines: ['OI'],
    bands: [{ cwlNm: 630.0, fwhmNm: 6.5, peakT: 0.9 }],
    cavities: 2,
    sizesMm: [31.75],
    coating: 'ion-beam sputtered stack',
    coatingType: 'hard',
    serialPrefix: 'BQX',
    units: plain(1),
  },
];

export const SUBSTRATES = ['fused-silica substrate', 'borosilicate substrate', 'low-expansion glass substrate'] as const;
export const EXTRAS = [
  'AR-coated back face',
  'blackened edge',
  'laser-etched serial on the rim',
  'anodised cell',
  'unmounted with a paper spacer',
  'slight edge chip outside the clear aperture',
] as const;

export const INSTRUMENT_STEPS: Readonly<Record<Instrument, number[]>> = {
  spectrograph: [0.05, 0.1],
  spectrophotometer: [0.1, 0.2, 0.25, 0.5],
  monochromator: [0.1, 0.2, 0.25],
  other: [0.2, 0.25],
};

export const SET_AOIS_DEG = [0, 4, 8, 12, 16] as const;

/** Temperatures of a multi-temperature set, °C. */
export const TEMP_SET_C = [5, 15, 25, 35] as const;
/** Angles of a polarised set; 0° is measured once (s and p coincide there), the others in s and in p. */
export const POLARISED_SET_AOIS_DEG = [0, 8, 16] as const;
/**
 * The demo world's true dCWL/dT by coating, nm/°C: inside the ranges of
 * lib/engine/temperature.ts, but not its defaults, so a fitted set shows its own figure.
 */
export const TRUE_TEMP_COEFF: Record<Coating, number> = { hard: 0.0031, soft: 0.0162, unknown: 0.006 };

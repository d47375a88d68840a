/**
 * Emission-line catalogue (docs/model.md §Lines) and the wavelength conversions that go
 * with it. Catalogue wavelengths are standard air; vacuum values are derived by
 * inverting the IAU air/vacuum relation so the two can never disagree.
 */

import { EngineInputError } from './errors';

export interface EmissionLine {
  id: string;
  name: string;
  airNm: number;
  vacuumNm: number;
}

/** Speed of light, km/s (exact by definition of the metre). */
export const SPEED_OF_LIGHT_KMS = 299_792.458;

/**
 * Refractive index of standard air at a vacuum wavelength (IAU standard,
 * Morton 2000 after Edlén and Birch & Downs). σ is the vacuum wavenumber in µm⁻¹.
 */
export function airIndexAtVacuum(vacuumNm: number): number {
  const sigma = 1e4 / (vacuumNm * 10);
  const s2 = sigma * sigma;
  return 1 + 8.34254e-5 + 2.406147e-2 / (130 - s2) + 1.5998e-4 / (38.9 - s2);
}

export function vacuumToAir(vacuumNm: number): number {
  return vacuumNm / airIndexAtVacuum(vacuumNm);
}

/**
 * The IAU relation is defined from vacuum to air, so the reverse is solved
 * numerically; n varies so slowly that a fixed-point iteration converges to
 * machine precision in a handful of steps.
 */
export function airToVacuum(airNm: number): number {
  let vac = airNm * 1.00028;
  for (let i = 0; i < 30; i++) {
    const next = airNm * airIndexAtVacuum(vac);
    if (Math.abs(next - vac) < 1e-13 * airNm) return next;
    vac = next;
  }
  return vac;
}

/** A source receding at v km/s moves its lines redward by λ·v/c. */
export function dopplerShift(nm: number, vKms: number): number {
  return nm * (1 + vKms / SPEED_OF_LIGHT_KMS);
}

function line(id: string, name: string, airNm: number): EmissionLine {
  return { id, name, airNm, vacuumNm: airToVacuum(airNm) };
}

/** The line ids the public API accepts, in catalogue order. */
export const LINES: readonly EmissionLine[] = Object.freeze([
  line('Ha', 'Hα', 656.28),
  line('Hb', 'Hβ', 486.13),
  line('Hg', 'Hγ', 434.05),
  line('OIII', '[O III]', 500.68),
  line('OIII-496', '[O III] 495.9', 495.89),
  line('NII-658', '[N II]', 658.35),
  line('NII-655', '[N II] 654.8', 654.8),
  line('SII-671', '[S II]', 671.64),
  line('SII-673', '[S II] 673.1', 673.08),
  line('HeII', 'He II', 468.57),
  line('OI', '[O I]', 630.03),
  line('ArIII', '[Ar III]', 713.58),
  line('OII', '[O II]', 372.6),
]);

/**
 * The second member of the [O II] doublet. Kept apart from LINES so the public
 * catalogue holds exactly the documented ids, but usable wherever an id is accepted.
 */
export const EXTRA_LINES: readonly EmissionLine[] = Object.freeze([line('OII-3729', '[O II] 372.9', 372.88)]);

/** The ids of LINES, for the schemas' enums (a submission's target lines, the catalogue's line filter). */
export const LINE_IDS = LINES.map((l) => l.id) as [string, ...string[]];

const BY_ID = new Map<string, EmissionLine>([...LINES, ...EXTRA_LINES].map((l) => [l.id, l]));

export function findLine(id: string): EmissionLine | undefined {
  return BY_ID.get(id);
}

export function getLine(id: string): EmissionLine {
  const found = BY_ID.get(id);
  if (!found) {
    throw new EngineInputError(`Unknown emission line "${id}".`, [
      { field: 'lines', message: `"${id}" is not one of ${LINES.map((l) => l.id).join(', ')}.` },
    ]);
  }
  return found;
}

/**
 * A line name as people type it, reduced to lower-case letters and digits (Greek letters spelled out as
 * their Latin initial: Hα → "ha"), so "H-alpha", "Halpha", "Hα" and "[O III]"/"OIII" meet. One pass, no
 * regular expression.
 */
export function squashLineName(text: string): string {
  let out = '';
  for (const ch of text.toLowerCase()) {
    if (ch === 'α') out += 'a';
    else if (ch === 'β') out += 'b';
    else if (ch === 'γ') out += 'g';
    else if ((ch >= 'a' && ch <= 'z') || (ch >= '0' && ch <= '9')) out += ch;
  }
  return out;
}

/**
 * Names people type for a line, squashed, beyond each line's id and name: spelled-out Greek, and the
 * ionisation stage as a digit (O3 for [O III], common practice among imagers); a family name means its
 * strongest member.
 */
const LINE_ALIASES: Record<string, string> = {
  halpha: 'Ha',
  hydrogenalpha: 'Ha',
  hbeta: 'Hb',
  hydrogenbeta: 'Hb',
  hgamma: 'Hg',
  o3: 'OIII',
  sii: 'SII-671',
  s2: 'SII-671',
  nii: 'NII-658',
  n2: 'NII-658',
  he2: 'HeII',
  o1: 'OI',
  ar3: 'ArIII',
  o2: 'OII',
};

const BY_NAME = new Map<string, string>();
for (const l of LINES) {
  for (const key of [squashLineName(l.id), squashLineName(l.name)]) if (!BY_NAME.has(key)) BY_NAME.set(key, l.id);
}
for (const [key, id] of Object.entries(LINE_ALIASES)) BY_NAME.set(key, id);

/** The catalogue line a typed name means (any usual spelling), or undefined. */
export function lineByName(text: string): EmissionLine | undefined {
  const exact = BY_ID.get(text.trim());
  if (exact) return exact;
  const id = BY_NAME.get(squashLineName(text));
  return id ? BY_ID.get(id) : undefined;
}

/** Lines close enough to leak through a filter made for the given one. */
const NEIGHBOURS: Record<string, string[]> = {
  Ha: ['NII-655', 'NII-658'],
  'NII-658': ['Ha', 'NII-655'],
  'NII-655': ['Ha', 'NII-658'],
  OIII: ['OIII-496', 'Hb'],
  'OIII-496': ['OIII', 'Hb'],
  Hb: ['OIII-496', 'OIII'],
  'SII-671': ['SII-673'],
  'SII-673': ['SII-671'],
  HeII: ['Hb'],
  Hg: [],
  OI: [],
  ArIII: [],
  OII: ['OII-3729'],
  'OII-3729': ['OII'],
};

export function neighboursOf(id: string): EmissionLine[] {
  getLine(id);
  return (NEIGHBOURS[id] ?? []).map((n) => getLine(n));
}

/**
 * Approximate display colour of a wavelength: piecewise-linear between hue
 * anchors across the visible band, dimmed towards its ends; grey-violet below
 * and deep red above so UV and IR lines still draw.
 */
const COLOUR_ANCHORS: [number, number, number, number][] = [
  [380, 0x5a, 0x00, 0x7a],
  [420, 0x6a, 0x00, 0xff],
  [450, 0x00, 0x28, 0xff],
  [485, 0x00, 0xb4, 0xff],
  [500, 0x00, 0xff, 0xa0],
  [530, 0x3c, 0xff, 0x00],
  [575, 0xf0, 0xff, 0x00],
  [600, 0xff, 0x90, 0x00],
  [640, 0xff, 0x10, 0x00],
  [700, 0xd0, 0x00, 0x00],
  [780, 0x6a, 0x00, 0x00],
];

export function lineColor(nm: number): string {
  const a = COLOUR_ANCHORS;
  let rgb: [number, number, number];
  if (!Number.isFinite(nm) || nm <= a[0][0]) rgb = [a[0][1], a[0][2], a[0][3]];
  else if (nm >= a[a.length - 1][0]) rgb = [a[a.length - 1][1], a[a.length - 1][2], a[a.length - 1][3]];
  else {
    let i = 0;
    while (a[i + 1][0] < nm) i++;
    const f = (nm - a[i][0]) / (a[i + 1][0] - a[i][0]);
    rgb = [1, 2, 3].map((k) => a[i][k] + f * (a[i + 1][k] - a[i][k])) as [number, number, number];
  }
  return '#' + rgb.map((v) => Math.round(v).toString(16).padStart(2, '0')).join('');
}

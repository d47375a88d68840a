/**
 * The cone study's state as it lives in the address bar, so a study can be
 * shared by its link. Values are kept as typed (strings) so half-typed input
 * such as "2." survives a round trip; `resolveSettings` turns them into the
 * numbers the engine takes, with a readable message for every value it cannot use.
 *
 *   curve   catalogue curve ids, comma-separated (at most four)
 *   optic   a saved or example optic id
 *   f obs field   a typed optic (f-number, obstruction ratio, chief-ray angle °), used instead of `optic`
 *   map     "sine" for an aplanatic optic (tangent otherwise)
 *   n       effective index (empty: each curve's fitted value, else 2.0)
 *   shift   pre-shift, nm toward the red
 *   t k tref   temperature °C, coefficient nm/°C, reference temperature °C
 *   line    a catalogue line id (Ha, OIII, …) or any wavelength in nm
 *   v       source radial velocity, km/s
 *   need    the line throughput the user needs, % (the verdict says when the error bar straddles it)
 */

import { findLine, lineByName, LINES } from '@/lib/engine/lines';
import { REQUEST_LIMITS as L } from '@/lib/engine/limits';
import type { Mapping } from '@/lib/engine/types';
import type { StudyOptic, StudySettings, TargetLine } from './types';
import { parseCurveRef } from '@/lib/labels';

export const MAX_STUDY_CURVES = 4;

export interface StudyQuery {
  curveIds: number[];
  opticId: number | null;
  f: string;
  obs: string;
  field: string;
  map: Mapping;
  n: string;
  shift: string;
  t: string;
  k: string;
  tref: string;
  line: string;
  v: string;
  need: string;
}

export type QueryField = 'f' | 'obs' | 'field' | 'n' | 'shift' | 't' | 'k' | 'tref' | 'line' | 'v' | 'need';
const TEXT_FIELDS: QueryField[] = ['f', 'obs', 'field', 'n', 'shift', 't', 'k', 'tref', 'line', 'v', 'need'];

type ParamSource = URLSearchParams | Record<string, string | string[] | undefined>;

function getAll(src: ParamSource, key: string): string[] {
  if (src instanceof URLSearchParams) return src.getAll(key);
  const v = src[key];
  return v === undefined ? [] : Array.isArray(v) ? v : [v];
}

function first(src: ParamSource, key: string): string {
  return (getAll(src, key)[0] ?? '').trim().slice(0, 40);
}

export function emptyQuery(): StudyQuery {
  return { curveIds: [], opticId: null, f: '', obs: '', field: '', map: 'tangent', n: '', shift: '', t: '', k: '', tref: '', line: '', v: '', need: '' };
}

export function parseStudyQuery(src: ParamSource): StudyQuery {
  const ids: number[] = [];
  for (const raw of getAll(src, 'curve')) {
    for (const part of raw.split(',')) {
      // "111" and the interface's own "C-111" both name curve 111 (lib/labels.ts)
      const id = parseCurveRef(part);
      if (id !== null && !ids.includes(id)) ids.push(id);
    }
  }
  const opticRaw = Number(first(src, 'optic'));
  const q = emptyQuery();
  q.curveIds = ids.slice(0, MAX_STUDY_CURVES);
  q.opticId = Number.isInteger(opticRaw) && opticRaw > 0 ? opticRaw : null;
  q.map = first(src, 'map') === 'sine' ? 'sine' : 'tangent';
  for (const key of TEXT_FIELDS) q[key] = first(src, key);
  return q;
}

/** The query string, in a fixed order and without empty values, so equal studies share one link. */
export function studySearch(q: StudyQuery): string {
  const p = new URLSearchParams();
  if (q.curveIds.length) p.set('curve', q.curveIds.join(','));
  const typed = q.f !== '' || q.obs !== '' || q.field !== '';
  if (typed) {
    for (const key of ['f', 'obs', 'field'] as const) if (q[key] !== '') p.set(key, q[key]);
  } else if (q.opticId != null) p.set('optic', String(q.opticId));
  if (q.map === 'sine') p.set('map', 'sine');
  for (const key of ['n', 'shift', 't', 'k', 'tref', 'line', 'v', 'need'] as const) if (q[key] !== '') p.set(key, q[key]);
  // Commas in the curve list read better unescaped, and are legal in a query.
  return p.toString().replace(/%2C/g, ',');
}

/** Reads a decimal as people type it: a comma decimal separator is accepted. */
export function readNumber(text: string): number | null {
  const t = text.trim().replace(',', '.');
  if (t === '' || !/^[-+]?(\d+\.?\d*|\.\d+)(e[-+]?\d+)?$/i.test(t)) return null;
  const v = Number(t);
  return Number.isFinite(v) ? v : null;
}

export const STUDY_LIMITS = {
  f: { min: L.fNumber[0], max: L.fNumber[1], label: 'f-number', unit: '' },
  obs: { min: 0, max: 0.9, label: 'Obstruction ratio', unit: '' },
  field: { min: L.fieldAngleDeg[0], max: L.fieldAngleDeg[1], label: 'Chief-ray angle', unit: '°' },
  n: { min: L.nEff[0], max: L.nEff[1], label: 'Effective index', unit: '' },
  shift: { min: L.preShiftNm[0], max: L.preShiftNm[1], label: 'Pre-shift', unit: ' nm' },
  t: { min: -80, max: 100, label: 'Temperature', unit: ' °C' },
  k: { min: L.tempCoeffNmPerC[0], max: L.tempCoeffNmPerC[1], label: 'Temperature coefficient', unit: ' nm/°C' },
  tref: { min: -80, max: 100, label: 'Reference temperature', unit: ' °C' },
  v: { min: -29_979, max: 29_979, label: 'Radial velocity', unit: ' km/s' },
  need: { min: 1, max: 100, label: 'Throughput you need', unit: ' %' },
} as const;

type Limited = keyof typeof STUDY_LIMITS;

/** A typed number checked against its range: null when empty, or a message saying what is wrong. */
export function checkNumber(field: Limited, text: string): { value: number | null; error?: string } {
  if (text.trim() === '') return { value: null };
  const v = readNumber(text);
  const l = STUDY_LIMITS[field];
  if (v === null) return { value: null, error: `${l.label} “${text}” is not a number` };
  if (v < l.min || v > l.max) return { value: null, error: `${l.label} must be between ${l.min} and ${l.max}${l.unit}` };
  return { value: v };
}

/** A catalogue line id (case and punctuation forgiven) or a wavelength in nm. */
export function readLine(text: string): { value: TargetLine | null; error?: string } {
  const t = text.trim();
  if (t === '') return { value: null };
  const byName = lineByName(t);
  if (byName) return { value: { id: byName.id } };
  const nm = readNumber(t.replace(/\s*nm$/i, ''));
  if (nm === null) return { value: null, error: `Line “${t}” is neither a catalogue line (${LINES.map((l) => l.id).join(', ')}) nor a wavelength in nm` };
  if (nm < 200 || nm > 2500) return { value: null, error: 'A line wavelength must be between 200 and 2500 nm' };
  return { value: { nm } };
}

export interface OpticChoice {
  id: number;
  name: string;
  fNumber: number;
  obstruction: number;
  fieldAngleDeg: number;
}

export interface ResolvedStudy {
  settings: StudySettings;
  /** Per field, what could not be used; the setting then falls back to its default. */
  errors: Partial<Record<QueryField | 'optic', string>>;
  /** The optic the study fell back to or named, for the optic picker. */
  opticSource: 'saved' | 'typed' | 'default';
}

/** The study's own default optic: a fast obstructed astrograph, f/2.5 with a 0.36 central obstruction. */
export const DEFAULT_F_NUMBER = 2.5;
export const DEFAULT_OBSTRUCTION = 0.36;

/** The optic a study opens with when none is named: the saved example closest to the default f-number, else the default itself. */
export function defaultOptic(optics: readonly OpticChoice[]): StudyOptic {
  const sorted = [...optics].sort((a, b) => Math.abs(a.fNumber - DEFAULT_F_NUMBER) - Math.abs(b.fNumber - DEFAULT_F_NUMBER) || a.id - b.id);
  const o = sorted[0];
  if (o) return { id: o.id, name: o.name, fNumber: o.fNumber, obstruction: o.obstruction, fieldAngleDeg: o.fieldAngleDeg, mapping: 'tangent' };
  return { id: null, name: `f/${DEFAULT_F_NUMBER}, ${DEFAULT_OBSTRUCTION.toFixed(2)} obstruction`, fNumber: DEFAULT_F_NUMBER, obstruction: DEFAULT_OBSTRUCTION, fieldAngleDeg: 0, mapping: 'tangent' };
}

/**
 * Settings the engine can run, from the typed values. `fallbackLine` is the
 * target when none is named (the first curve's own line).
 */
export function resolveSettings(q: StudyQuery, optics: readonly OpticChoice[], fallbackLine: TargetLine): ResolvedStudy {
  const errors: ResolvedStudy['errors'] = {};
  const num = (field: Limited) => {
    const r = checkNumber(field, q[field]);
    if (r.error) errors[field] = r.error;
    return r.value;
  };

  let optic = defaultOptic(optics);
  let opticSource: ResolvedStudy['opticSource'] = 'default';
  const saved = q.opticId != null ? optics.find((o) => o.id === q.opticId) : undefined;
  if (q.opticId != null && !saved) errors.optic = `Optic ${q.opticId} is not one you can use; showing ${optic.name} instead`;
  if (saved) {
    optic = { id: saved.id, name: saved.name, fNumber: saved.fNumber, obstruction: saved.obstruction, fieldAngleDeg: saved.fieldAngleDeg, mapping: 'tangent' };
    opticSource = 'saved';
  }
  const typed = q.f !== '' || q.obs !== '' || q.field !== '';
  if (typed) {
    const f = num('f');
    const obs = num('obs');
    const field = num('field');
    optic = {
      id: null,
      name: 'Typed optic',
      fNumber: f ?? optic.fNumber,
      obstruction: q.obs === '' ? 0 : (obs ?? optic.obstruction),
      fieldAngleDeg: q.field === '' ? 0 : (field ?? optic.fieldAngleDeg),
      mapping: 'tangent',
    };
    if (q.f === '') errors.f = 'Type the f-number of the optic';
    opticSource = 'typed';
  }
  optic.mapping = q.map;

  const lineRead = readLine(q.line);
  if (lineRead.error) errors.line = lineRead.error;

  const t = num('t');
  const k = num('k');
  const settings: StudySettings = {
    optic,
    nEff: num('n'),
    preShiftNm: num('shift') ?? 0,
    tempC: t,
    tempCoeffNmPerC: k,
    refTempC: num('tref'),
    line: lineRead.value ?? fallbackLine,
    radialVelocityKms: num('v') ?? 0,
    neededThroughput: ((n) => (n == null ? null : n / 100))(num('need')),
  };
  return { settings, errors, opticSource };
}

/** The line a study targets when none is typed: the first curve's own line, else Hα. */
export function fallbackLineFor(curves: readonly { lines: string[] }[]): TargetLine {
  for (const c of curves) for (const id of c.lines) if (findLine(id)) return { id };
  return { id: 'Ha' };
}

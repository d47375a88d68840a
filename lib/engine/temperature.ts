/**
 * Temperature drift of an interference filter's passband (docs/model.md §Pre-shift):
 *   CWL(t) = CWL(t_ref) + k·(t − t_ref),
 * with k = dCWL/dT in nm/°C. It depends on the coating:
 *   - hard (sputtered, ion-assisted) dense oxide coatings drift about
 *     0.002–0.005 nm/°C (common practice: makers of hard-coated filters quote figures
 *     in this range);
 *   - soft (evaporated) porous coatings drift about 0.01–0.02 nm/°C (W. J. Smith,
 *     Modern Optical Engineering, ch. 11; the figure the app quoted before);
 *   - unknown: no default; a coefficient must be typed or fitted.
 * These are defaults, said to be defaults wherever they are used.
 *
 * From one unit measured at several temperatures, k is the least-squares slope
 *   k = Σ (t_i − t̄)(λ_i − λ̄) / Σ (t_i − t̄)².
 */

import { EngineInputError } from './errors';

export const COATINGS = ['hard', 'soft', 'unknown'] as const;
export type Coating = (typeof COATINGS)[number];

export interface CoatingDefault {
  /** Default dCWL/dT, nm/°C (the middle of the range). */
  nmPerC: number;
  range: [number, number];
  source: string;
}

export const COATING_TEMP_COEFF: Record<Exclude<Coating, 'unknown'>, CoatingDefault> = {
  hard: { nmPerC: 0.0035, range: [0.002, 0.005], source: 'common practice for hard (sputtered) coatings' },
  soft: { nmPerC: 0.015, range: [0.01, 0.02], source: 'W. J. Smith, Modern Optical Engineering, ch. 11, for evaporated coatings' },
};

export const COATING_NAMES: Record<Coating, string> = {
  hard: 'hard (sputtered, ion-assisted)',
  soft: 'soft (evaporated)',
  unknown: 'not known',
};

/** The default coefficient for a coating, or null when the coating is not known. */
export function defaultTempCoeff(coating: Coating | null | undefined): CoatingDefault | null {
  if (coating === 'hard' || coating === 'soft') return COATING_TEMP_COEFF[coating];
  return null;
}

export interface TempFit {
  nmPerC: number;
  /** CWL at 20 °C from the fitted line, nm. */
  cwlAt20Nm: number;
  rmsResidualNm: number;
  points: number;
}

export function fitTempCoeff(measurements: { tempC: number; cwlNm: number }[]): TempFit {
  const ok = measurements.filter((m) => Number.isFinite(m?.tempC) && Number.isFinite(m?.cwlNm) && m.cwlNm > 0);
  if (ok.length < measurements.length) {
    throw new EngineInputError('Every measurement needs a finite temperature and a positive CWL.', [{ field: 'measurements', message: 'a temperature or CWL is missing' }]);
  }
  const temps = new Set(ok.map((m) => m.tempC));
  if (temps.size < 2) {
    throw new EngineInputError('dCWL/dT needs curves measured at two or more different temperatures.', [{ field: 'measurements', message: `only ${temps.size} distinct temperature` }]);
  }
  const n = ok.length;
  const mt = ok.reduce((s, m) => s + m.tempC, 0) / n;
  const ml = ok.reduce((s, m) => s + m.cwlNm, 0) / n;
  let stt = 0;
  let stl = 0;
  for (const m of ok) {
    stt += (m.tempC - mt) ** 2;
    stl += (m.tempC - mt) * (m.cwlNm - ml);
  }
  const k = stl / stt;
  const a = ml - k * mt;
  let ss = 0;
  for (const m of ok) ss += (m.cwlNm - (a + k * m.tempC)) ** 2;
  return { nmPerC: k, cwlAt20Nm: a + 20 * k, rmsResidualNm: Math.sqrt(ss / n), points: n };
}

export interface TempSetResult {
  fit: TempFit | null;
  checks: { code: string; level: 'info' | 'warn'; message: string }[];
}

/**
 * dCWL/dT from the files of one submission: the files measured at one AOI, in
 * one polarisation, and at two or more temperatures (the largest such group),
 * compared with the coating's default range when the coating is declared. Off
 * normal incidence s and p light sit apart, so they are never mixed in one group.
 */
export function temperatureSet(files: { aoiDeg: number; tempC?: number; cwlNm: number | null; polarization?: string }[], coating?: Coating): TempSetResult {
  const byAoi = new Map<string, { tempC: number; cwlNm: number }[]>();
  for (const f of files) {
    if (f.tempC === undefined || f.cwlNm === null) continue;
    const key = `${f.aoiDeg}|${f.aoiDeg > 0 ? (f.polarization ?? 'unpolarized') : ''}`;
    const list = byAoi.get(key) ?? [];
    list.push({ tempC: f.tempC, cwlNm: f.cwlNm });
    byAoi.set(key, list);
  }
  const groups = [...byAoi.entries()].filter(([, l]) => new Set(l.map((m) => m.tempC)).size >= 2).sort((a, b) => b[1].length - a[1].length);
  if (groups.length === 0) return { fit: null, checks: [] };
  const [key, list] = groups[0];
  const aoi = Number(key.split('|')[0]);
  const fit = fitTempCoeff(list);
  const temps = list.map((m) => m.tempC);
  const text = `dCWL/dT ${fit.nmPerC.toFixed(4)} nm/°C fitted from ${list.length} curves at ${aoi}° AOI between ${Math.min(...temps)} and ${Math.max(...temps)} °C (RMS residual ${fit.rmsResidualNm.toFixed(3)} nm).`;
  const d = defaultTempCoeff(coating);
  const checks: TempSetResult['checks'] = [];
  if (d && coating && (fit.nmPerC < d.range[0] / 2 || fit.nmPerC > d.range[1] * 2)) {
    checks.push({ code: 'set-temp', level: 'warn', message: `${text} That is far from the ${d.range[0]}–${d.range[1]} nm/°C usual for a ${COATING_NAMES[coating]} coating; check the declared coating and temperatures.` });
  } else {
    checks.push({ code: 'set-temp', level: 'info', message: text });
  }
  return { fit, checks };
}

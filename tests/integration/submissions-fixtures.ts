// Test curves made on the spot: a Butterworth passband, the textbook idealisation of a
// multi-cavity interference filter, T(λ) = T_peak / (1 + ((λ − CWL)/(FWHM/2))^(2n)),
// which is exactly half of its peak at CWL ± FWHM/2. A curve "measured" at AOI θ is the
// normal-incidence curve scaled by s(θ) = sqrt(1 − sin²θ / n_eff²) (docs/model.md §Angle shift).

export const HA_NM = 656.3;

export function angleScale(aoiDeg: number, nEff: number): number {
  const s = Math.sin((aoiDeg * Math.PI) / 180);
  return Math.sqrt(1 - (s * s) / (nEff * nEff));
}

export type Passband = { cwlNm?: number; fwhmNm?: number; peak?: number; order?: number; aoiDeg?: number; nEff?: number; fromNm?: number; toNm?: number; stepNm?: number; noiseSeed?: number };

export function butterworthPoints(p: Passband = {}) {
  const cwl0 = p.cwlNm ?? HA_NM;
  const fwhm0 = p.fwhmNm ?? 3;
  const s = angleScale(p.aoiDeg ?? 0, p.nEff ?? 2);
  const cwl = cwl0 * s;
  const half = (fwhm0 * s) / 2;
  const order = p.order ?? 3;
  const peak = p.peak ?? 0.9;
  const from = p.fromNm ?? cwl0 - 20;
  const to = p.toNm ?? cwl0 + 20;
  const step = p.stepNm ?? 0.05;
  const wavelengthNm: number[] = [];
  const transmission: number[] = [];
  let seed = p.noiseSeed ?? 0;
  for (let i = 0; from + i * step <= to + 1e-9; i++) {
    const wl = from + i * step;
    let t = peak / (1 + ((wl - cwl) / half) ** (2 * order));
    if (p.noiseSeed !== undefined) {
      // a tiny deterministic wobble so two test files never hash the same
      seed = (seed * 1103515245 + 12345) % 2147483648;
      t += ((seed / 2147483648) - 0.5) * 1e-4;
    }
    wavelengthNm.push(Number(wl.toFixed(3)));
    transmission.push(Number(Math.max(0, t).toFixed(6)));
  }
  return { wavelengthNm, transmission };
}

export function curveCsv(p: Passband = {}, header = 'wavelength_nm,transmission'): string {
  const { wavelengthNm, transmission } = butterworthPoints(p);
  return [header, ...wavelengthNm.map((w, i) => `${w},${transmission[i]}`)].join('\n') + '\n';
}

export function metadataFor(overrides: Record<string, unknown> = {}) {
  return {
    label: 'Test Optics Hα 3 nm',
    maker: 'Test Optics (invented)',
    lines: ['Ha'],
    nominalCwlNm: HA_NM,
    nominalFwhmNm: 3,
    licence: 'CC-BY-4.0',
    method: { instrument: 'spectrophotometer', resolutionNm: 0.05, beam: 'collimated', aoiDeg: 0, temperatureC: 20, polarization: 'unpolarized', measuredOn: '2026-01-15', lab: 'Test bench' },
    ...overrides,
  };
}

export type Upload = { name: string; text: string | Uint8Array };

/** The multipart body of POST /api/submissions (and /revise): `file` once per file, `metadata` as JSON text. */
export function submissionForm(files: Upload[], metadata?: unknown): FormData {
  const form = new FormData();
  if (metadata !== undefined) form.append('metadata', typeof metadata === 'string' ? metadata : JSON.stringify(metadata));
  for (const f of files) form.append('file', new Blob([f.text as BlobPart], { type: 'text/csv' }), f.name);
  return form;
}

let uniq = 0;
/** A fresh single-curve upload: unique wobble so the library's duplicate check stays quiet. */
export function singleCurve(name = 'ha.csv', extra: Passband = {}): Upload {
  uniq += 1;
  return { name, text: curveCsv({ noiseSeed: (Date.now() % 1_000_000) + uniq * 7919, ...extra }) };
}

/**
 * The tables behind every picture of a cone study, as one CSV file: a `#`
 * comment names each table and the inputs it was computed from, a blank line
 * separates tables. Percentages are written as fractions 0–1, like the API.
 */

import { rowsToCsv, type CsvCell } from '@/components/charts/csv';
import { commentLine } from '@/lib/csv/safe';
import { predictCwl } from '@/lib/engine/neff';
import type { StudyResults } from './compute';
import type { CurveStudy, StudySettings } from './types';
import { verdictFor } from './verdict';
import { formatCurveId } from '@/lib/labels';

/** Column names carry the id: units of one filter share a label. */
const nameOf = (st: CurveStudy) => (st.curve.id != null ? `${formatCurveId(st.curve.id)} ${st.curve.label}` : `${st.curve.label} (pasted)`);
const round = (v: number | null, d: number) => (v == null ? 'none' : String(Math.round(v * 10 ** d) / 10 ** d));

function section(title: string, rows: CsvCell[][]): string {
  return `${commentLine(title)}\r\n${rowsToCsv(rows)}`;
}

/** Columns of unequal length padded with blanks (curves are sampled differently). */
function columns(headers: string[], cols: readonly (readonly CsvCell[])[]): CsvCell[][] {
  const n = cols.reduce((m, c) => Math.max(m, c.length), 0);
  const rows: CsvCell[][] = [headers];
  for (let i = 0; i < n; i++) rows.push(cols.map((c) => c[i] ?? null));
  return rows;
}

export function studyCsv(results: StudyResults, s: StudySettings): string {
  const ok = results.outcomes.flatMap((o) => (o.ok ? [o.study] : []));
  const o = s.optic;
  const parts: string[] = [];
  parts.push(
    [
      '# Bandcone cone study',
      commentLine(`optic: ${o.name}; f/${o.fNumber}; obstruction ${o.obstruction}; chief-ray angle at the field edge ${o.fieldAngleDeg} deg; mapping ${o.mapping}`),
      commentLine(`pre-shift ${s.preShiftNm} nm; temperature ${s.tempC == null ? 'not set' : `${s.tempC} C`}; coefficient ${s.tempCoeffNmPerC == null ? 'not set' : `${s.tempCoeffNmPerC} nm/C`}; radial velocity ${s.radialVelocityKms} km/s`),
      '# model: first-order thin-film effective-index model; estimates only. Rely on the maker\'s data for decisions.',
      '',
    ].join('\r\n'),
  );

  parts.push(
    section(
      'verdict (fractions 0-1; speed-equivalent as f-number)',
      [
        ['curve_id', 'label', 'line', 'line_nm', 'n_eff', 'n_eff_source', 'throughput', 'collimated', 'speed_equivalent_f_number', 'field_edge_deg', 'field_edge_throughput', 'best_pre_shift_nm', 'best_throughput', 'contrast_per_nm', 'neighbours'],
        ...ok.map((st) => {
          const p = st.onAxis.lines[0];
          return [
            st.curve.id ?? st.curve.key,
            st.curve.label,
            st.lineId,
            p.wavelengthNm,
            st.nEff,
            st.nEffSource,
            p.throughput,
            p.collimated,
            p.speedEquivalentFNumber,
            st.edge?.fieldAngleDeg ?? null,
            st.edge?.throughput ?? null,
            st.onAxis.bestPreShift?.nm ?? null,
            st.onAxis.bestPreShift?.throughput ?? null,
            st.onAxis.contrast,
            st.onAxis.neighbours.map((n) => `${n.id} ${n.wavelengthNm.toFixed(2)} nm: ${n.throughput.toFixed(4)}`).join('; '),
          ];
        }),
      ],
    ),
  );

  const h = results.histogram;
  const degs = [...new Set([...h.onAxis.map((b) => b.deg), ...(h.edge ?? []).map((b) => b.deg)])].sort((a, b) => a - b);
  const onMap = new Map(h.onAxis.map((b) => [b.deg, b.weight]));
  const edgeMap = new Map((h.edge ?? []).map((b) => [b.deg, b.weight]));
  parts.push(
    section('angle of incidence reaching the filter: share of light per 0.5 deg bin', [
      ['aoi_deg', 'on_axis', ...(h.edge ? [`field_edge_${h.edgeDeg}_deg`] : [])],
      ...degs.map((d) => [d, onMap.get(d) ?? 0, ...(h.edge ? [edgeMap.get(d) ?? 0] : [])]),
    ]),
  );

  for (const st of ok) {
    const cone = st.onAxis.coneCurve;
    parts.push(
      section(
        `measured and cone-averaged curve: ${nameOf(st)}`,
        columns(
          ['measured_wavelength_nm', 'measured_transmission', 'cone_wavelength_nm', 'cone_transmission'],
          [st.curve.points.wavelengthNm, st.curve.points.transmission, cone?.wavelengthNm ?? [], cone?.transmission ?? []],
        ),
      ),
    );
  }

  if (ok.length) {
    const f = ok[0].fSweep.x;
    parts.push(section('line throughput against f-number (on axis)', [['f_number', ...ok.map(nameOf)], ...f.map((x, i) => [x, ...ok.map((st) => st.fSweep.y[i])])]));
    const fieldHeaders = ['chief_ray_deg', ...ok.map(nameOf)];
    parts.push(section('line throughput across the field (centre to edge)', [fieldHeaders, ...ok[0].fieldSweep.x.map((x, i) => [x, ...ok.map((st) => st.fieldSweep.y[i])])]));
    parts.push(
      section(
        'line throughput against pre-shift (on axis)',
        columns(
          ok.flatMap((st) => [`${nameOf(st)} pre_shift_nm`, `${nameOf(st)} throughput`]),
          ok.flatMap((st) => [st.shiftSweep.x, st.shiftSweep.y]),
        ),
      ),
    );
  }

  for (const set of results.sets) {
    parts.push(
      section(`CWL against AOI: ${set.label}; fitted n_eff ${round(set.nEff, 4)}, normal-incidence CWL ${round(set.cwl0Nm, 3)} nm, RMS residual ${round(set.rmsResidualNm, 4)} nm`, [
        ['aoi_deg', 'cwl_nm', 'fitted_cwl_nm'],
        ...set.points.map((p) => [p.aoiDeg, p.cwlNm, set.nEff && set.cwl0Nm ? predictCwl(set.cwl0Nm, set.nEff, p.aoiDeg) : null]),
      ]),
    );
  }

  const ex = results.explorer;
  if (ex) {
    const rows: CsvCell[][] = [['fwhm_nm', 'pre_shift_nm', 'throughput']];
    ex.shiftsNm.forEach((d, r) => ex.widthsNm.forEach((w, c) => rows.push([w, d, ex.tau[r][c]])));
    parts.push(section(`ideal flat-top passband: line throughput at ${ex.lineNm.toFixed(3)} nm, n_eff ${round(ex.nEff, 4)}`, rows));
  }

  const words = ok.map((st) => {
    const v = verdictFor(st, s.optic, s.preShiftNm, s.radialVelocityKms);
    return [nameOf(st), v.headline, ...v.items.map((i) => `${i.label}: ${i.value} ${i.text}`)];
  });
  if (words.length) parts.push(section('verdict in words', [['curve', 'statement'], ...words.flatMap((w) => w.slice(1).map((t) => [w[0], t]))]));

  return parts.join('\r\n');
}

'use client';

import { useMemo, useRef, useState } from 'react';
import { SpectrumChart, type SpectrumSeries, type SpectrumLine } from '@/components/charts/spectrum-chart';
import { formatFNumber, formatNm, formatRatio, formatTransmission } from '@/components/charts/format';
import { LINES } from '@/lib/engine/lines';
import { fieldEdgeWords, fieldPointWords, headlineOptic } from '@/lib/optics/headline-field';
import type { OpticChoice } from './types';
import { api, type Json } from '@/lib/api-client';
import type { ConeModelResult } from '@/lib/engine/types';

/** The cone model's answer, and the same model at the optic's field edge when it has one (the second number). */
type ConeAnswer = Json<ConeModelResult> & { edge?: { fieldAngleDeg: number; lines: Json<ConeModelResult>['lines'] } | null };

/**
 * The measured curve with its catalogued lines, and on request the cone-averaged
 * curve for a chosen optic (POST /api/model/cone with includeCurve), dashed in the same hue.
 */
export function CurveChart(props: {
  curveId: number;
  title: string;
  points: { wavelengthNm: number[]; transmission: number[] };
  lineIds: string[];
  nominal: { cwlNm: number; fwhmNm: number } | null;
  optics: OpticChoice[];
  defaultNEff: number;
  fittedNEff: boolean;
}) {
  const [opticId, setOpticId] = useState<string>(props.optics[0] ? String(props.optics[0].id) : '');
  const [nEff, setNEff] = useState(String(props.defaultNEff));
  const [overlay, setOverlay] = useState(false);
  const [answer, setAnswer] = useState<{ key: string; data: ConeAnswer } | null>(null);
  const [busy, setBusy] = useState(false);
  const [error, setError] = useState<string | null>(null);
  const optic = props.optics.find((o) => String(o.id) === opticId);
  const key = `${opticId}|${nEff}`;
  // the last overlay asked for: an older answer arriving late is dropped
  const wanted = useRef('');

  // The headline and the overlay are on axis (headline-field.ts); the optic's field edge is a second number.
  // Ticked stays ticked: another optic or index recomputes the overlay instead of removing it.
  const load = async (forOptic: string, forNEff: string) => {
    const optic = props.optics.find((o) => String(o.id) === forOptic);
    const key = `${forOptic}|${forNEff}`;
    wanted.current = key;
    if (!optic || answer?.key === key) return;
    setError(null);
    const n = Number(forNEff);
    if (!(n >= 1 && n <= 4)) {
      setError('The effective index must be between 1.0 and 4.0.');
      return;
    }
    setBusy(true);
    const model = async (fieldAngleDeg: number, includeCurve: boolean) => {
      const res = await api.model.cone({
        curveId: props.curveId,
        optic: { fNumber: optic.fNumber, obstruction: optic.obstruction, fieldAngleDeg },
        nEff: n,
        lines: props.lineIds.length ? props.lineIds : undefined,
        includeCurve,
      });
      if (!res.ok) throw new Error(res.failure.error);
      return res.data;
    };
    try {
      const head = await model(headlineOptic(optic).fieldAngleDeg, true);
      const edge = optic.fieldAngleDeg > 0 ? { fieldAngleDeg: optic.fieldAngleDeg, lines: (await model(optic.fieldAngleDeg, false)).lines } : null;
      if (wanted.current === key) setAnswer({ key, data: { ...head, edge } });
    } catch (e) {
      if (wanted.current === key) setError(e instanceof Error ? e.message : 'The cone model failed.');
    } finally {
      if (wanted.current === key) setBusy(false);
    }
  };

  const lines: SpectrumLine[] = useMemo(() => {
    const lo = props.points.wavelengthNm[0];
    const hi = props.points.wavelengthNm[props.points.wavelengthNm.length - 1];
    return LINES.filter((l) => l.airNm >= lo && l.airNm <= hi).map((l) => ({ id: l.id, name: l.name, nm: l.airNm }));
  }, [props.points]);

  const current = answer && answer.key === key ? answer.data : null;
  const series: SpectrumSeries[] = useMemo(() => {
    const s: SpectrumSeries[] = [{ name: 'Measured', wavelengthNm: props.points.wavelengthNm, transmission: props.points.transmission, kind: 'measured' }];
    if (overlay && current?.coneCurve && optic) {
      s.push({ name: `Cone-averaged, ${optic.name}, ${fieldPointWords(0)}`, wavelengthNm: current.coneCurve.wavelengthNm, transmission: current.coneCurve.transmission, kind: 'cone' });
    }
    return s;
  }, [props.points, overlay, current, optic]);

  return (
    <div className="space-y-3">
      <SpectrumChart title={props.title} series={series} lines={lines} nominal={props.nominal} fileName={`bandcone-curve-${props.curveId}`} titleAs="h2" />
      <div className="rounded-card border border-rule bg-panel px-3 py-3 text-sm" data-testid="cone-overlay">
        <div className="flex flex-wrap items-end gap-3">
          <label className="flex items-center gap-2">
            <input type="checkbox" checked={overlay} onChange={(e) => {
                setOverlay(e.target.checked);
                if (e.target.checked) void load(opticId, nEff);
              }} disabled={!optic || busy} className="h-4 w-4 accent-[rgb(var(--c-accent))]" data-testid="overlay-toggle" />
            <span>Overlay the cone-averaged curve for</span>
          </label>
          <label className="min-w-0">
            <span className="sr-only">Optic</span>
            <select
              value={opticId}
              onChange={(e) => {
                setOpticId(e.target.value);
                if (overlay) void load(e.target.value, nEff);
              }}
              className="max-w-[18rem] rounded-card border border-rule bg-paper px-2 py-1"
            >
              {props.optics.map((o) => (
                <option key={o.id} value={o.id}>{`${o.mine ? 'Mine: ' : ''}${o.name} · f/${o.fNumber.toFixed(1)}, ${o.obstruction.toFixed(2)}`}</option>
              ))}
            </select>
          </label>
          <label className="flex items-center gap-2">
            <span className="text-muted">n_eff</span>
            <input
              value={nEff}
              onChange={(e) => {
                setNEff(e.target.value);
                if (overlay) void load(opticId, e.target.value);
              }}
              inputMode="decimal"
              className="figures w-16 rounded-card border border-rule bg-paper px-2 py-1 text-right"
              aria-label="Effective index"
            />
          </label>
          <span className="text-xs text-muted">{props.fittedNEff ? 'fitted from this unit’s angle set' : 'typical of hard-coated filters; set your own'}</span>
        </div>
        {busy ? <p className="mt-2 text-muted">Running the cone model…</p> : null}
        {error ? <p role="alert" className="mt-2 text-bad">{error}</p> : null}
        {overlay && current && optic ? (
          <div className="mt-2 space-y-1" data-testid="cone-result">
            <p>
              On {optic.name} ({formatFNumber(optic.fNumber)}, obstruction {formatRatio(optic.obstruction)}),{' '}
              <span data-testid="headline-field">{fieldPointWords(0)}</span>:{' '}
              {current.lines.map((l, i) => (
                <span key={l.id}>
                  {i ? '; ' : ''}
                  {LINES.find((x) => x.id === l.id)?.name ?? l.id} keeps <span data-testid="headline-throughput" data-raw={l.throughput}>{formatTransmission(l.throughput)}</span> (collimated{' '}
                  {formatTransmission(l.collimated)}), like {l.speedEquivalentFNumber === null ? 'no signal' : formatFNumber(l.speedEquivalentFNumber)}
                </span>
              ))}
              {current.bestPreShift ? (
                <span>
                  ; best pre-shift {formatNm(current.bestPreShift.nm)} would give {formatTransmission(current.bestPreShift.throughput)}
                </span>
              ) : null}
              .
            </p>
            {current.edge ? (
              <p data-testid="edge-result">
                And {fieldEdgeWords(current.edge.fieldAngleDeg)}:{' '}
                {current.edge.lines
                  .map((l) => `${LINES.find((x) => x.id === l.id)?.name ?? l.id} keeps ${formatTransmission(l.throughput)}`)
                  .join('; ')}
                .
              </p>
            ) : null}
            {current.warnings.length ? <p className="text-xs text-muted">{current.warnings.join(' ')}</p> : null}
          </div>
        ) : null}
      </div>
    </div>
  );
}

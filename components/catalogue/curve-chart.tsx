'use client';

import { useMemo, useState } from 'react';
import { SpectrumChart, type SpectrumSeries, type SpectrumLine } from '@/components/charts/spectrum-chart';
import { formatFNumber, formatNm, formatRatio, formatTransmission } from '@/components/charts/format';
import { LINES } from '@/lib/engine/lines';
import type { OpticChoice } from './types';
import { api, type Json } from '@/lib/api-client';
import type { ConeModelResult } from '@/lib/engine/types';

type ConeAnswer = Json<ConeModelResult>;

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

  const run = async (want: boolean) => {
    setOverlay(want);
    setError(null);
    if (!want || !optic || answer?.key === key) return;
    const n = Number(nEff);
    if (!(n >= 1 && n <= 4)) {
      setError('The effective index must be between 1.0 and 4.0.');
      setOverlay(false);
      return;
    }
    setBusy(true);
    try {
      const res = await api.model.cone({
        curveId: props.curveId,
        optic: { fNumber: optic.fNumber, obstruction: optic.obstruction, fieldAngleDeg: optic.fieldAngleDeg },
        nEff: n,
        lines: props.lineIds.length ? props.lineIds : undefined,
        includeCurve: true,
      });
      if (!res.ok) throw new Error(res.failure.error);
      setAnswer({ key, data: res.data });
    } catch (e) {
      setError(e instanceof Error ? e.message : 'The cone model failed.');
      setOverlay(false);
    } finally {
      setBusy(false);
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
      s.push({ name: `Cone-averaged, ${optic.name}`, wavelengthNm: current.coneCurve.wavelengthNm, transmission: current.coneCurve.transmission, kind: 'cone' });
    }
    return s;
  }, [props.points, overlay, current, optic]);

  return (
    <div className="space-y-3">
      <SpectrumChart title={props.title} series={series} lines={lines} nominal={props.nominal} fileName={`bandcone-curve-${props.curveId}`} titleAs="h2" />
      <div className="rounded-card border border-rule bg-panel px-3 py-3 text-sm" data-testid="cone-overlay">
        <div className="flex flex-wrap items-end gap-3">
          <label className="flex items-center gap-2">
            <input type="checkbox" checked={overlay} onChange={(e) => run(e.target.checked)} disabled={!optic || busy} className="h-4 w-4 accent-[rgb(var(--c-accent))]" data-testid="overlay-toggle" />
            <span>Overlay the cone-averaged curve for</span>
          </label>
          <label className="min-w-0">
            <span className="sr-only">Optic</span>
            <select
              value={opticId}
              onChange={(e) => {
                setOpticId(e.target.value);
                setOverlay(false);
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
                setOverlay(false);
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
              On {optic.name} ({formatFNumber(optic.fNumber)}, obstruction {formatRatio(optic.obstruction)}
              {optic.fieldAngleDeg ? `, ${optic.fieldAngleDeg}° field` : ''}):{' '}
              {current.lines.map((l, i) => (
                <span key={l.id}>
                  {i ? '; ' : ''}
                  {LINES.find((x) => x.id === l.id)?.name ?? l.id} keeps {formatTransmission(l.throughput)} (collimated {formatTransmission(l.collimated)}), like{' '}
                  {l.speedEquivalentFNumber === null ? 'no signal' : formatFNumber(l.speedEquivalentFNumber)}
                </span>
              ))}
              {current.bestPreShift ? (
                <span>
                  ; best pre-shift {formatNm(current.bestPreShift.nm)} would give {formatTransmission(current.bestPreShift.throughput)}
                </span>
              ) : null}
              .
            </p>
            {current.warnings.length ? <p className="text-xs text-muted">{current.warnings.join(' ')}</p> : null}
          </div>
        ) : null}
      </div>
    </div>
  );
}

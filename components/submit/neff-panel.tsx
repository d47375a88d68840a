'use client';

import { useEffect, useMemo, useState } from 'react';
import { fixed, formatNm } from '@/components/charts/format';
import { XYChart, type XYSeries } from '@/components/charts/xy-chart';
import { predictCwl } from '@/lib/engine/neff';
import { api } from '@/lib/api-client';
import type { NeffFit } from './preview-api';

export type AngleCwl = { name: string; aoiDeg: number; cwlNm: number };

/** The effective index fitted from the set's CWLs (docs/model.md §Effective index), refitted whenever an AOI or a preview changes. */
export function NeffPanel({ points }: { points: AngleCwl[] }) {
  const [outcome, setOutcome] = useState<{ key: string; fit?: NeffFit; error?: string }>();
  const key = JSON.stringify(points.map((p) => [p.aoiDeg, p.cwlNm]));
  const distinct = new Set(points.map((p) => p.aoiDeg)).size;

  useEffect(() => {
    if (distinct < 2) return;
    const controller = new AbortController();
    const t = setTimeout(() => {
      api.model.neff({ measurements: points.map(({ aoiDeg, cwlNm }) => ({ aoiDeg, cwlNm })) }, controller.signal)
        .then((r) => setOutcome(r.ok ? { key, fit: r.data } : { key, error: r.failure.error }))
        .catch(() => undefined);
    }, 300);
    return () => {
      clearTimeout(t);
      controller.abort();
    };
    // the key captures every input of the fit
    // eslint-disable-next-line react-hooks/exhaustive-deps
  }, [key, distinct]);

  const busy = outcome?.key !== key;
  const fit = outcome?.fit;
  const error = busy ? undefined : outcome?.error;

  // the measured CWLs against AOI, and the fitted curve drawn smoothly across and a little beyond them
  const series: XYSeries[] = useMemo(() => {
    if (!fit) return [];
    const sorted = [...points].sort((a, b) => a.aoiDeg - b.aoiDeg);
    const top = Math.min(60, Math.max(...sorted.map((p) => p.aoiDeg)) + 5);
    const xs = Array.from({ length: 61 }, (_, k) => (top * k) / 60);
    return [
      { name: 'Measured CWL', x: sorted.map((p) => p.aoiDeg), y: sorted.map((p) => p.cwlNm), type: 'scatter', colorIndex: 0, pointLabels: sorted.map((p) => p.name) },
      { name: `Fit, n_eff ${fixed(fit.nEff, 3)}`, x: xs, y: xs.map((a) => predictCwl(fit.cwl0Nm, fit.nEff, a)), dashed: true, colorIndex: 0 },
    ];
  }, [fit, points]);

  return (
    <section aria-labelledby="neff-heading" className="space-y-2 rounded-card border border-rule bg-panel p-4" data-testid="neff-panel">
      <h3 id="neff-heading" className="font-semibold">Effective index of the set</h3>
      {distinct < 2 ? (
        <p className="text-sm text-muted">Give the files at least two different AOIs (and let their previews finish) to fit the effective index.</p>
      ) : error ? (
        <p role="alert" className="text-sm text-bad">{error}</p>
      ) : fit ? (
        <>
          <p className="text-sm" role="status">
            n<sub>eff</sub> <span className="figures text-lg font-semibold" data-testid="neff-value">{fixed(fit.nEff, 3)}</span>
            <span className="mx-2 text-muted">·</span>CWL at normal incidence <span className="figures">{formatNm(fit.cwl0Nm)}</span>
            <span className="mx-2 text-muted">·</span>RMS residual <span className="figures">{formatNm(fit.rmsResidualNm, 3)}</span>
            {busy ? <span className="ml-2 text-xs text-muted">refitting…</span> : null}
          </p>
          <XYChart
            title="CWL against angle of incidence"
            series={series}
            xName="AOI (°)"
            yName="CWL (nm)"
            xFormat="deg"
            yFormat="nm"
            xMin={0}
            height={260}
            fileName="bandcone-neff-fit"
            titleAs="h4"
          />
          {/* on a phone the table scrolls inside its own box rather than widening the page */}
          <div className="max-w-xl overflow-x-auto">
          <table className="w-full text-sm">
            <caption className="sr-only">Measured and fitted CWL per file</caption>
            <thead>
              <tr className="border-b border-rule text-left text-xs text-muted">
                <th scope="col" className="py-1 pr-3 font-normal">File</th>
                <th scope="col" className="py-1 pr-3 text-right font-normal">AOI</th>
                <th scope="col" className="py-1 pr-3 text-right font-normal">Measured CWL</th>
                <th scope="col" className="py-1 pr-3 text-right font-normal">Fitted CWL</th>
                <th scope="col" className="py-1 text-right font-normal">Residual</th>
              </tr>
            </thead>
            <tbody className="figures">
              {[...points].sort((a, b) => a.aoiDeg - b.aoiDeg).map((p) => {
                const fitted = predictCwl(fit.cwl0Nm, fit.nEff, p.aoiDeg);
                return (
                  <tr key={p.name} className="border-b border-rule/50">
                    <td className="max-w-[7rem] truncate py-1 pr-3 font-sans sm:max-w-[10rem]">{p.name}</td>
                    <td className="py-1 pr-3 text-right">{fixed(p.aoiDeg, 1)}°</td>
                    <td className="py-1 pr-3 text-right">{formatNm(p.cwlNm)}</td>
                    <td className="py-1 pr-3 text-right">{formatNm(fitted)}</td>
                    <td className="py-1 text-right">{formatNm(p.cwlNm - fitted, 3)}</td>
                  </tr>
                );
              })}
            </tbody>
          </table>
          </div>
          <p className="text-xs text-muted">Fitted by least squares to λ² = a + b·sin²θ (docs/model.md §Effective index); coatings usually sit between 1.5 and 2.3.</p>
        </>
      ) : (
        <p className="text-sm text-muted" role="status">Fitting…</p>
      )}
    </section>
  );
}

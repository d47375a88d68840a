'use client';

import { useMemo } from 'react';
import { HistogramChart } from '@/components/charts/histogram-chart';
import { HeatmapChart } from '@/components/charts/heatmap-chart';
import { SpectrumChart, type SpectrumLine, type SpectrumSeries } from '@/components/charts/spectrum-chart';
import { XYChart, type XYMarker, type XYSeries } from '@/components/charts/xy-chart';
import { fixed, formatDeg, formatFNumber, formatNm, formatRatio, formatSignedNm, formatTransmission } from '@/components/charts/format';
import { findLine } from '@/lib/engine/lines';
import type { AngleBin } from '@/lib/engine/types';
import { EXPLORER_HIGHLIGHT_WIDTHS_NM } from '@/lib/study/explorer';
import { fNumberCaption } from '@/lib/study/captions';
import type { StudyResults } from '@/lib/study/compute';
import type { CurveStudy, StudySettings } from '@/lib/study/types';
import { formatCurveId } from '@/lib/labels';

/** Short series names: labels repeat between units of one filter, ids do not. */
export function seriesName(st: CurveStudy): string {
  return st.curve.id != null ? `${formatCurveId(st.curve.id)} ${st.curve.label}` : `${st.curve.label} (pasted)`;
}

function opticText(s: StudySettings): string {
  return `${formatFNumber(s.optic.fNumber)}, ${formatRatio(s.optic.obstruction)} obstruction`;
}

function angleStats(bins: AngleBin[]) {
  const used = bins.filter((b) => b.weight > 1e-6);
  if (!used.length) return null;
  const total = used.reduce((t, b) => t + b.weight, 0);
  const mean = used.reduce((t, b) => t + b.deg * b.weight, 0) / total;
  return { from: used[0].deg - 0.25, to: used[used.length - 1].deg + 0.25, mean };
}

export function StudyCharts({ results, settings, studies }: { results: StudyResults; settings: StudySettings; studies: CurveStudy[] }) {
  const opticLabel = opticText(settings);
  const lineName = studies[0] ? lineNameOf(studies[0]) : 'id' in settings.line ? (findLine(settings.line.id)?.name ?? settings.line.id) : `${fixed(settings.line.nm, 2)} nm`;
  const any = studies.length > 0;

  const histogram = useMemo(() => {
    const h = results.histogram;
    const series = [{ name: `On axis (${opticLabel})`, bins: h.onAxis }];
    if (h.edge) series.push({ name: `Field edge, ${formatDeg(h.edgeDeg)} chief ray`, bins: h.edge });
    return series;
  }, [results.histogram, opticLabel]);
  const onStats = angleStats(results.histogram.onAxis);
  const edgeStats = results.histogram.edge ? angleStats(results.histogram.edge) : null;

  const spectrum = useMemo<SpectrumSeries[]>(
    () =>
      studies.flatMap((st, i) => [
        { name: seriesName(st), wavelengthNm: st.curve.points.wavelengthNm, transmission: st.curve.points.transmission, kind: 'measured' as const, colorIndex: i },
        ...(st.onAxis.coneCurve
          ? [{ name: `${seriesName(st)}, cone-averaged at ${opticLabel}`, wavelengthNm: st.onAxis.coneCurve.wavelengthNm, transmission: st.onAxis.coneCurve.transmission, kind: 'cone' as const, colorIndex: i }]
          : []),
      ]),
    [studies, opticLabel],
  );
  const spectrumLines = useMemo<SpectrumLine[]>(() => {
    const out = new Map<string, SpectrumLine>();
    for (const st of studies) {
      const p = st.onAxis.lines[0];
      out.set(p.id, { id: p.id, name: findLine(p.id)?.name ?? `${fixed(p.wavelengthNm, 2)} nm`, nm: p.wavelengthNm });
      for (const n of st.onAxis.neighbours) out.set(n.id, { id: n.id, name: findLine(n.id)?.name ?? n.id, nm: n.wavelengthNm });
    }
    return [...out.values()];
  }, [studies]);
  const spectrumWindow = useMemo<[number, number] | null>(() => {
    if (!studies.length) return null;
    const centre = studies[0].lineNm;
    const fw = Math.max(...studies.map((st) => st.fwhm0Nm ?? 5));
    const half = Math.max(8, 2.2 * fw);
    return [centre - half, centre + half];
  }, [studies]);

  // each curve with its error band: dashed edges in its own colour at ∓ its wavelength-scale uncertainty
  const fSeries = useMemo<XYSeries[]>(
    () =>
      studies.flatMap((st, i) => [
        { name: seriesName(st), x: st.fSweep.x, y: st.fSweep.y, colorIndex: i },
        ...(st.fSweepRange
          ? [
              { name: `${seriesName(st)}, low (−${st.fSweepRange.uncertaintyNm} nm scale error)`, x: st.fSweep.x, y: st.fSweepRange.low, colorIndex: i, dashed: true },
              { name: `${seriesName(st)}, high (+${st.fSweepRange.uncertaintyNm} nm scale error)`, x: st.fSweep.x, y: st.fSweepRange.high, colorIndex: i, dashed: true },
            ]
          : []),
      ]),
    [studies],
  );
  const fieldSeries = useMemo<XYSeries[]>(() => studies.map((st, i) => ({ name: seriesName(st), x: st.fieldSweep.x, y: st.fieldSweep.y, colorIndex: i })), [studies]);
  const shiftSeries = useMemo<XYSeries[]>(() => studies.map((st, i) => ({ name: seriesName(st), x: st.shiftSweep.x, y: st.shiftSweep.y, colorIndex: i })), [studies]);
  const shiftMarkers = useMemo<XYMarker[]>(() => {
    const m: XYMarker[] = [{ value: settings.preShiftNm, label: `yours ${formatSignedNm(settings.preShiftNm)}`, emphasis: true }];
    const seen = new Set<number>();
    studies.forEach((st) => {
      const b = st.onAxis.bestPreShift;
      if (!b || seen.has(b.nm)) return;
      seen.add(b.nm);
      m.push({ value: b.nm, label: studies.length > 1 ? `best ${formatSignedNm(b.nm)} (${st.curve.id != null ? formatCurveId(st.curve.id) : st.curve.key})` : `best ${formatSignedNm(b.nm)}` });
    });
    return m;
  }, [studies, settings.preShiftNm]);

  const setSeries = useMemo<XYSeries[]>(
    () =>
      results.sets.flatMap((set, i) => [
        { name: `${set.label}: measured CWL`, x: set.points.map((p) => p.aoiDeg), y: set.points.map((p) => p.cwlNm), type: 'scatter' as const, colorIndex: i },
        ...(set.nEff ? [{ name: `${set.label}: fit, n_eff ${formatRatio(set.nEff)}`, x: set.fitted.x, y: set.fitted.y, dashed: true, colorIndex: i }] : []),
      ]),
    [results.sets],
  );

  const ex = results.explorer;
  const exPoints = useMemo(
    () => (ex ? ex.markers.map((m) => ({ name: formatCurveId(m.key.replace(/^c/, '')), x: m.widthNm, y: m.shiftNm, value: m.throughput })) : []),
    [ex],
  );

  return (
    <div className="space-y-6">
      <div className="grid gap-6 xl:grid-cols-2">
        {any ? (
          <SpectrumChart
            title="Measured and cone-averaged passbands"
            series={spectrum}
            lines={spectrumLines}
            xRange={spectrumWindow}
            className="xl:col-span-2"
            summaryPlacement="side"
            fileName="cone-study-passbands"
            summary={
              studies.length ? (
                <ul className="space-y-1">
                  {studies.map((st) => (
                    <li key={st.curve.key}>
                      <span className="text-ink">{seriesName(st)}</span>: the cone at {opticLabel} moves and widens the passband; at {lineNameOf(st)} it passes{' '}
                      {formatTransmission(st.onAxis.lines[0].throughput)} against {formatTransmission(st.onAxis.lines[0].collimated)} collimated
                      {st.coneBandwidthNm != null ? `; cone-averaged effective bandwidth ${formatNm(st.coneBandwidthNm)}` : ''}.
                    </li>
                  ))}
                </ul>
              ) : (
                'Choose a curve to see its passband.'
              )
            }
          />
        ) : null}
        <HistogramChart
          title="Angles of incidence reaching the filter"
          series={histogram}
          fileName="cone-study-angles"
          className={any ? '' : 'xl:col-span-2'}
          summaryPlacement={any ? 'below' : 'side'}
          aspect={any ? 16 / 9 : 21 / 9}
          summary={
            <>
              {onStats
                ? `On axis the light meets the filter between ${formatDeg(onStats.from)} and ${formatDeg(onStats.to)}, ${formatDeg(onStats.mean)} on average`
                : 'No angles.'}
              {edgeStats ? `; at the field edge between ${formatDeg(edgeStats.from)} and ${formatDeg(edgeStats.to)}, ${formatDeg(edgeStats.mean)} on average.` : '.'}
              {settings.optic.obstruction > 0 ? ` The ${formatRatio(settings.optic.obstruction)} obstruction blocks the central rays, which would meet the filter closest to normal.` : ''}
            </>
          }
        />
        {any ? (
          <>
            <XYChart
              title={`${lineName} throughput against f-number`}
              series={fSeries}
              xName="f-number"
              yName="Line throughput (%)"
              xFormat="fnumber"
              yAsPercent
              xMin={1}
              xMax={10}
              markers={[{ value: settings.optic.fNumber, label: `your optic ${formatFNumber(settings.optic.fNumber)}`, emphasis: true }]}
              fileName="cone-study-f-number"
              summary={
                studies.length ? (
                  <ul className="space-y-1">
                    {studies.map((st) => (
                      <li key={st.curve.key} data-testid="f-number-caption" data-curve={st.curve.key}>
                        <span className="text-ink">{seriesName(st)}</span>: {fNumberCaption(st.fSweep.x, st.fSweep.y, 0.8)} (with a {formatRatio(settings.optic.obstruction)}{' '}
                        obstruction{settings.preShiftNm !== 0 ? ` and a ${formatSignedNm(settings.preShiftNm)} pre-shift` : ''}).
                      </li>
                    ))}
                  </ul>
                ) : null
              }
            />
            <XYChart
              title={`${lineName} throughput across the field`}
              series={fieldSeries}
              xName="Chief-ray angle (°)"
              yName="Line throughput (%)"
              xFormat="deg"
              yAsPercent
              markers={settings.optic.fieldAngleDeg > 0 ? [{ value: settings.optic.fieldAngleDeg, label: `field edge ${formatDeg(settings.optic.fieldAngleDeg)}`, emphasis: true }] : []}
              fileName="cone-study-field"
              summary={
                studies.length ? (
                  <>
                    {settings.optic.fieldAngleDeg > 0
                      ? `From the centre to the ${formatDeg(settings.optic.fieldAngleDeg)} field edge: `
                      : 'This optic has no chief-ray angle set, so the chart runs to 10° for reference: '}
                    {studies
                      .map((st) => `${seriesName(st)} ${formatTransmission(st.fieldSweep.y[0])} → ${formatTransmission(st.fieldSweep.y[st.fieldSweep.y.length - 1])}`)
                      .join('; ')}
                    .
                  </>
                ) : null
              }
            />
            <XYChart
              title={`${lineName} throughput against pre-shift`}
              series={shiftSeries}
              xName="Pre-shift (nm)"
              yName="Line throughput (%)"
              xFormat="nm-signed"
              yAsPercent
              markers={shiftMarkers}
              fileName="cone-study-pre-shift"
              summary={
                studies.length ? (
                  <ul className="space-y-1">
                    {studies.map((st) => (
                      <li key={st.curve.key}>
                        <span className="text-ink">{seriesName(st)}</span>:{' '}
                        {st.onAxis.bestPreShift
                          ? `best at ${formatSignedNm(st.onAxis.bestPreShift.nm)} (${formatTransmission(st.onAxis.bestPreShift.throughput)}); at your ${formatSignedNm(settings.preShiftNm)} it is ${formatTransmission(st.onAxis.lines[0].throughput)}.`
                          : 'no FWHM, so no best pre-shift.'}
                      </li>
                    ))}
                  </ul>
                ) : null
              }
            />
          </>
        ) : null}
        {results.sets.length ? (
          <XYChart
            title="CWL against angle of incidence, with the fitted effective index"
            series={setSeries}
            xName="Angle of incidence (°)"
            yName="CWL (nm)"
            xFormat="deg"
            yFormat="nm"
            fileName="cone-study-cwl-aoi"
            summary={
              <ul className="space-y-1">
                {results.sets.map((set) => (
                  <li key={set.curveKey}>
                    <span className="text-ink">{set.label}</span>:{' '}
                    {set.nEff && set.cwl0Nm
                      ? `${set.points.length} angles fit λ² = a + b·sin²θ with n_eff ${formatRatio(set.nEff)}, normal-incidence CWL ${formatNm(set.cwl0Nm)}, RMS residual ${fixed(set.rmsResidualNm, 3)} nm.`
                      : set.error}
                  </li>
                ))}
              </ul>
            }
          />
        ) : null}
      </div>
      {ex ? (
        <HeatmapChart
          title={`Which bandwidth and pre-shift suit this optic? Ideal flat-top passbands at ${lineName}`}
          x={ex.widthsNm}
          y={ex.shiftsNm}
          values={ex.tau}
          points={exPoints}
          xName="Passband FWHM (nm)"
          yName="Pre-shift (nm)"
          valueName="Line throughput"
          range={[0, 1]}
          aspect={16 / 9}
          summaryPlacement="side"
          fileName="cone-study-bandwidth-explorer"
          summary={<ExplorerSummary results={results} settings={settings} />}
        />
      ) : null}
    </div>
  );
}

function lineNameOf(st: CurveStudy): string {
  const l = findLine(st.lineId);
  return l ? l.name : `${fixed(st.lineNm, 2)} nm`;
}

function ExplorerSummary({ results, settings }: { results: StudyResults; settings: StudySettings }) {
  const ex = results.explorer!;
  const pick = EXPLORER_HIGHLIGHT_WIDTHS_NM.map((w) => ex.ridge.find((r) => Math.abs(r.widthNm - w) < 1e-9)).filter(Boolean) as typeof ex.ridge;
  return (
    <div className="space-y-2">
      <p>
        Each cell is an ideal filter (100 % inside its FWHM, 0 outside) for {formatNm(ex.lineNm)} on {opticText(settings)}, n_eff {formatRatio(ex.nEff)}; the scale under
        the map gives the share of the line each shade passes.
      </p>
      <ul className="space-y-0.5">
        {pick.map((r) => (
          <li key={r.widthNm}>
            {formatNm(r.widthNm, Number.isInteger(r.widthNm) ? 0 : 1)} wide: best at {formatSignedNm(r.shiftNm, 1)}, {formatTransmission(r.throughput)}
          </li>
        ))}
      </ul>
      {ex.markers.length ? (
        <p>
          Dots are your curves at their own FWHM and centre offset from the line:{' '}
          {ex.markers.map((m) => `${formatCurveId(m.key.replace(/^c/, ''))} ${formatNm(m.widthNm)} at ${formatSignedNm(m.shiftNm)} (${formatTransmission(m.throughput)} measured)`).join('; ')}.
        </p>
      ) : null}
    </div>
  );
}

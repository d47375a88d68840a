'use client';

import { useEffect, useMemo, useState } from 'react';
import Link from 'next/link';
import { useRouter } from 'next/navigation';
import { SpectrumChart, type SpectrumSeries, type SpectrumLine } from '@/components/charts/spectrum-chart';
import { LegendSwatch } from '@/components/charts/chart-frame';
import { useChartTheme } from '@/components/charts/use-chart-theme';
import { formatDeg, formatFNumber, formatNm, formatRatio, formatTransmission, fixed } from '@/components/charts/format';
import { LINES } from '@/lib/engine/lines';
import { DEFAULT_N_EFF } from '@/lib/catalogue/fitness-grid';
import { api } from '@/lib/api-client';
import { useCompareBoard, compareHref } from './compare-board';
import type { CompareOptic } from '@/lib/catalogue/compare';
import type { CompareCurve } from '@/lib/catalogue/compare-board';
import { INSTRUMENT_NAMES, lineName } from './labels';
import { SolarCaution, ModelCaution } from './solar-caution';
import type { OpticChoice } from './types';
import { LICENCE_SHORT, formatCurveId, labelOf } from '@/lib/labels';
import { fieldPointWords, headlineFieldAngle, headlineOptic } from '@/lib/optics/headline-field';

type Throughput = { id: string; throughput: number; speedEquivalentFNumber: number | null };

function describeOptic(o: CompareOptic): string {
  const parts = [`f/${o.fNumber.toFixed(1)}`, o.obstruction.toFixed(2), fieldPointWords(headlineFieldAngle(o.fieldAngleDeg))];
  if (o.nEff !== undefined) parts.push(`n_eff ${o.nEff}`);
  return parts.join(', ');
}

/** The choice standing for the optic the catalogue search used (from the board's address). */
const FROM_SEARCH = 'search';

export function CompareView(props: { curves: CompareCurve[]; missing: number[]; optics: OpticChoice[]; searchOptic?: CompareOptic | null }) {
  const router = useRouter();
  const board = useCompareBoard();
  const theme = useChartTheme();
  const ids = props.curves.map((c) => c.id);
  const [opticId, setOpticId] = useState(props.searchOptic ? FROM_SEARCH : props.optics[0] ? String(props.optics[0].id) : '');
  const [results, setResults] = useState<{ key: string; byCurve: Record<number, Throughput[] | string> } | null>(null);
  const optic: (CompareOptic & { fieldAngleDeg: number }) | undefined =
    opticId === FROM_SEARCH && props.searchOptic
      ? headlineOptic(props.searchOptic, props.searchOptic.fieldAngleDeg)
      : (() => {
          // a saved optic's chief-ray angle is its field edge; the headline is on axis (headline-field.ts)
          const o = props.optics.find((x) => String(x.id) === opticId);
          return o ? headlineOptic(o) : undefined;
        })();
  const namedNEff = opticId === FROM_SEARCH ? props.searchOptic?.nEff : undefined;
  const key = `${opticId}|${ids.join(',')}`;

  // the URL is the selection; the board in this browser follows it
  const idsKey = ids.join(',');
  useEffect(() => {
    if (idsKey !== board.ids.join(',')) board.replace(idsKey ? idsKey.split(',').map(Number) : []);
  }, [idsKey]); // eslint-disable-line react-hooks/exhaustive-deps

  useEffect(() => {
    if (!optic || props.curves.length === 0) return;
    let cancelled = false;
    Promise.all(
      props.curves.map(async (c) => {
        const res = await api.model.cone({
          curveId: c.id,
          optic: { fNumber: optic.fNumber, obstruction: optic.obstruction, fieldAngleDeg: optic.fieldAngleDeg },
          nEff: namedNEff ?? c.nEff ?? DEFAULT_N_EFF,
          lines: c.lines.length ? c.lines : undefined,
        });
        return [c.id, res.ok ? (res.data.lines as Throughput[]) : res.failure.error] as const;
      }),
    ).then((pairs) => {
      if (!cancelled) setResults({ key, byCurve: Object.fromEntries(pairs) });
    });
    return () => {
      cancelled = true;
    };
  }, [key]); // eslint-disable-line react-hooks/exhaustive-deps

  const series: SpectrumSeries[] = useMemo(
    () => props.curves.map((c, i) => ({ name: `${formatCurveId(c.id)}: ${c.title}`, wavelengthNm: c.points.wavelengthNm, transmission: c.points.transmission, kind: 'measured', colorIndex: i })),
    [props.curves],
  );
  const lines: SpectrumLine[] = useMemo(() => {
    const wanted = new Set(props.curves.flatMap((c) => c.lines));
    return LINES.filter((l) => wanted.has(l.id)).map((l) => ({ id: l.id, name: l.name, nm: l.airNm }));
  }, [props.curves]);

  const remove = (id: number) => router.push(compareHref(ids.filter((x) => x !== id), props.searchOptic));
  const current = results?.key === key ? results.byCurve : null;

  if (props.curves.length === 0) {
    return (
      <div className="space-y-3 rounded-card border border-dashed border-rule bg-panel px-5 py-6">
        <h1 className="text-2xl font-semibold tracking-tight">Compare board</h1>
        <p>No curves on the board yet. Tick up to eight curves in the <Link href="/curves" className="text-accent underline-offset-4 hover:underline">catalogue</Link> and open the board from there; the address of this page then holds your selection, so you can send it.</p>
        {props.missing.length ? <p className="text-sm text-muted">Not found or not public: curve {props.missing.map(formatCurveId).join(', ')}.</p> : null}
      </div>
    );
  }

  const rows: [string, (c: CompareCurve) => React.ReactNode][] = [
    ['Lines', (c) => c.lines.map(lineName).join(', ')],
    ['Peak T', (c) => formatTransmission(c.peakT)],
    ['CWL', (c) => formatNm(c.cwlNm)],
    ['FWHM', (c) => formatNm(c.fwhmNm)],
    ['Mean in-band T', (c) => formatTransmission(c.meanInBandT)],
    ['Effective bandwidth', (c) => formatNm(c.effectiveBandwidthNm)],
    ['Blocking', (c) => (c.blockingOd === null ? '—' : `OD ${fixed(c.blockingOd, 1)}`)],
    ['Measured AOI', (c) => formatDeg(c.aoiDeg)],
    ['Effective index', (c) => (c.nEff === null ? `${formatRatio(DEFAULT_N_EFF)} (assumed)` : `${formatRatio(c.nEff)} (fitted)`)],
    ['Instrument', (c) => INSTRUMENT_NAMES[c.instrument] ?? c.instrument],
    ['Contributor', (c) => c.contributor ?? '—'],
    ['Licence', (c) => labelOf(LICENCE_SHORT, c.licence)],
  ];

  return (
    <div className="space-y-5">
      <header className="flex flex-wrap items-end gap-3">
        <h1 className="text-2xl font-semibold tracking-tight">Compare board</h1>
        <span className="text-sm text-muted">
          {props.curves.length} of 8 curves · <Link href="/curves" className="text-accent underline-offset-4 hover:underline">add more from the catalogue</Link>
        </span>
      </header>
      {props.missing.length ? <p className="text-sm text-muted">Not found or not public: curve {props.missing.map(formatCurveId).join(', ')}.</p> : null}
      {props.curves.some((c) => c.lines.includes('Ha')) ? <SolarCaution compact /> : null}

      <SpectrumChart title="Measured curves on the compare board" series={series} lines={lines} fileName="bandcone-compare" titleAs="h2" />

      <section aria-label="Numbers side by side" className="space-y-2">
        <div className="flex flex-wrap items-center gap-3 text-sm">
          <h2 className="font-medium">Numbers side by side</h2>
          {/* On a phone the select takes the row's width and its long option names are cut inside it, not past the screen. */}
          <label className="flex min-w-0 max-w-full flex-wrap items-center gap-2">
            <span className="text-muted">Line throughput on</span>
            <select value={opticId} onChange={(e) => setOpticId(e.target.value)} className="w-full min-w-0 max-w-full rounded-card border border-rule bg-panel px-2 py-1 sm:w-auto sm:max-w-[20rem]" data-testid="compare-optic">
              {props.searchOptic ? <option value={FROM_SEARCH}>{`From your search · ${describeOptic(props.searchOptic)}`}</option> : null}
              {props.optics.map((o) => (
                <option key={o.id} value={o.id}>{`${o.mine ? 'Mine: ' : ''}${o.name} · f/${o.fNumber.toFixed(1)}, ${o.obstruction.toFixed(2)}`}</option>
              ))}
            </select>
          </label>
        </div>
        <div className="overflow-auto rounded-card border border-rule">
          <table className="w-full border-collapse text-sm" data-testid="compare-table">
            <caption className="sr-only">The numbers of each curve on the board, one column per curve</caption>
            <thead className="sticky top-0 bg-panel">
              <tr>
                <th scope="col" className="border-b border-rule px-3 py-2 text-left font-medium">
                  <span className="sr-only">Number</span>
                </th>
                {props.curves.map((c, i) => (
                  <th key={c.id} scope="col" className="min-w-[10rem] border-b border-rule px-3 py-2 text-right align-bottom font-medium">
                    <span className="flex items-start justify-end gap-2">
                      <LegendSwatch item={{ key: String(c.id), name: c.title, ...theme.series(i) }} />
                      <Link href={`/curves/${c.id}`} className="text-left hover:text-accent hover:underline">
                        {c.title}
                      </Link>
                    </span>
                    <button type="button" onClick={() => remove(c.id)} className="mt-1 text-xs font-normal text-muted underline-offset-4 hover:underline" aria-label={`Remove curve ${formatCurveId(c.id)} from the board`}>
                      remove
                    </button>
                  </th>
                ))}
              </tr>
            </thead>
            <tbody>
              {rows.map(([label, cell]) => (
                <tr key={label} className="border-b border-rule/60">
                  <th scope="row" className="px-3 py-1.5 text-left font-normal text-muted">
                    {label}
                  </th>
                  {props.curves.map((c) => (
                    <td key={c.id} className="figures px-3 py-1.5 text-right">
                      {cell(c)}
                    </td>
                  ))}
                </tr>
              ))}
              <tr className="border-b border-rule/60 bg-accent/5">
                <th scope="row" className="px-3 py-1.5 text-left font-normal">
                  Line throughput{optic ? ` at ${formatFNumber(optic.fNumber)}, ${formatRatio(optic.obstruction)}, ` : ''}
                  {optic ? <span data-testid="headline-field">{fieldPointWords(optic.fieldAngleDeg)}</span> : null}
                </th>
                {props.curves.map((c) => {
                  const r = current?.[c.id];
                  return (
                    <td key={c.id} className="figures px-3 py-1.5 text-right" data-testid={`compare-throughput-${c.id}`}>
                      {!current ? '…' : typeof r === 'string' ? <span className="text-bad">{r}</span> : r?.map((l) => (
                        <div key={l.id}>
                          {lineName(l.id)} {formatTransmission(l.throughput)} <span className="text-muted">like {l.speedEquivalentFNumber === null ? '—' : formatFNumber(l.speedEquivalentFNumber)}</span>
                        </div>
                      ))}
                    </td>
                  );
                })}
              </tr>
            </tbody>
          </table>
        </div>
        <ModelCaution />
      </section>
    </div>
  );
}

'use client';

import { SpectrumChart, type SpectrumSeries } from '@/components/charts/spectrum-chart';
import { findLine } from '@/lib/engine/lines';

export type PlotCurve = { name: string; wavelengthNm: readonly number[]; transmission: readonly number[] };

/** Measured curve(s) over the maker's nominal passband, with the target lines marked. */
export function PassbandChart(props: { title: string; curves: PlotCurve[]; nominal?: { cwlNm?: number; fwhmNm?: number } | null; lineIds?: readonly string[]; fileName?: string; height?: number; titleAs?: 'h2' | 'h3' | 'h4' }) {
  const series: SpectrumSeries[] = props.curves.map((c) => ({ name: c.name, wavelengthNm: c.wavelengthNm, transmission: c.transmission, kind: 'measured' }));
  const lines = (props.lineIds ?? []).flatMap((id) => {
    const l = findLine(id);
    return l ? [{ id: l.id, name: l.name, nm: l.airNm }] : [];
  });
  const n = props.nominal;
  const nominal = n && typeof n.cwlNm === 'number' && typeof n.fwhmNm === 'number' && n.cwlNm > 0 && n.fwhmNm > 0 ? { cwlNm: n.cwlNm, fwhmNm: n.fwhmNm } : null;
  return <SpectrumChart title={props.title} series={series} lines={lines} nominal={nominal} fileName={props.fileName} height={props.height} titleAs={props.titleAs ?? 'h4'} />;
}

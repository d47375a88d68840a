'use client';

import { PassbandChart } from '@/components/submit/passband-chart';
import { formatCurveId } from '@/lib/labels';

/** Every curve of the current revision against the declared nominal passband. */
export function SubmissionChart(props: {
  label: string;
  points: { id: number; aoiDeg: number; wavelengthNm: number[]; transmission: number[] }[];
  nominalCwlNm?: number;
  nominalFwhmNm?: number;
  lines?: string[];
}) {
  const curves = props.points.map((p) => ({ name: `${formatCurveId(p.id)} at AOI ${p.aoiDeg.toFixed(1)}°`, wavelengthNm: p.wavelengthNm, transmission: p.transmission }));
  return (
    <PassbandChart title={`${props.label}: measured ${curves.length > 1 ? 'curves' : 'curve'} and the nominal passband (shaded)`} curves={curves}
      nominal={{ cwlNm: props.nominalCwlNm, fwhmNm: props.nominalFwhmNm }} lineIds={props.lines} fileName={props.label} titleAs="h3" />
  );
}

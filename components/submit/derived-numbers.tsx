import { formatNm, formatTransmission, fixed, MISSING } from '@/components/charts/format';
import { findLine } from '@/lib/engine/lines';
import type { PreviewMetrics } from './preview-api';

/** The engine's derived numbers, each with its unit; "—" says a number is undefined, never zero. */
export function DerivedNumbers({ metrics, lines }: { metrics: PreviewMetrics; lines?: string[] }) {
  const rows: [string, string][] = [
    ['Peak T', formatTransmission(metrics.peakT)],
    ['CWL', formatNm(metrics.cwlNm)],
    ['FWHM', formatNm(metrics.fwhmNm)],
    ['Mean in-band T', formatTransmission(metrics.meanInBandT)],
    ['Effective bandwidth', formatNm(metrics.effectiveBandwidthNm)],
    ['Blocking', metrics.blockingOd == null ? MISSING : `OD ${fixed(metrics.blockingOd, 1)}`],
  ];
  if (metrics.rangeNm) rows.push(['Measured range', `${fixed(metrics.rangeNm[0], 1)}–${fixed(metrics.rangeNm[1], 1)} nm`]);
  if (metrics.sampleCount !== undefined) rows.push(['Samples', String(metrics.sampleCount)]);
  if (metrics.medianStepNm !== undefined) rows.push(['Median step', formatNm(metrics.medianStepNm, 3)]);
  const wanted = new Set(lines ?? []);
  const lineRows = metrics.lines.filter((l) => wanted.size === 0 ? l.transmission > 0.01 : wanted.has(l.id));
  return (
    <div className="space-y-2">
      <dl className="grid grid-cols-[auto_1fr] gap-x-4 gap-y-0.5 text-sm" data-testid="derived-numbers">
        {rows.map(([k, v]) => (
          <div key={k} className="contents">
            <dt className="text-muted">{k}</dt>
            <dd className="figures text-right sm:text-left" data-metric={k}>{v}</dd>
          </div>
        ))}
      </dl>
      {lineRows.length > 0 ? (
        <div>
          <p className="text-xs text-muted">Transmission at {wanted.size ? 'the target lines' : 'lines in the passband'}</p>
          <ul className="flex flex-wrap gap-x-4 text-sm">
            {lineRows.map((l) => (
              <li key={l.id}>
                {findLine(l.id)?.name ?? l.id} <span className="figures">{l.covered === false ? 'not measured' : formatTransmission(l.transmission)}</span>
              </li>
            ))}
          </ul>
        </div>
      ) : null}
    </div>
  );
}

'use client';

import { bucketLabel, INSTRUMENT_NAMES, lineName } from './labels';
import type { Query, SearchResponse } from './types';

type Patch = Record<string, string | undefined>;
interface Suggestion {
  text: string;
  patch: Patch;
  gain?: number;
}

const pct = (v: string) => `${Number((Number(v) * 100).toPrecision(4))} %`;

/** What to loosen when nothing matches, most helpful first; counts come from the facets where they are known. */
export function suggestions(q: Query, data: SearchResponse | undefined): Suggestion[] {
  const out: Suggestion[] = [];
  const sum = (f?: { count: number }[]) => f?.reduce((s, x) => s + x.count, 0);
  if (q.minThroughput) {
    const lower = Math.max(0, Number(q.minThroughput) - 0.1);
    out.push({ text: `Ask for ${pct(String(lower))} of the line instead of ${pct(q.minThroughput)}`, patch: { minThroughput: lower > 0 ? String(Number(lower.toFixed(3))) : undefined } });
    out.push({ text: 'Drop the minimum line throughput', patch: { minThroughput: undefined } });
  }
  if (q.fwhmMin || q.fwhmMax) {
    const best = data?.facets.fwhm.slice().sort((a, b) => b.count - a.count)[0];
    out.push({ text: 'Remove the FWHM limit', patch: { fwhmMin: undefined, fwhmMax: undefined }, gain: sum(data?.facets.fwhm) });
    if (best) out.push({ text: `Try FWHM ${bucketLabel(best.key)}`, patch: { fwhmMin: best.key.split(/[-+]/)[0], fwhmMax: best.key.endsWith('+') ? undefined : best.key.split('-')[1] }, gain: best.count });
  }
  if (q.line) {
    const other = data?.facets.line.filter((f) => f.key !== q.line).sort((a, b) => b.count - a.count)[0];
    out.push({ text: `Any line instead of ${lineName(q.line)}`, patch: { line: undefined } });
    if (other) out.push({ text: `Look at ${lineName(other.key)}`, patch: { line: other.key }, gain: other.count });
  }
  if (q.method) out.push({ text: `Any instrument, not only ${INSTRUMENT_NAMES[q.method] ?? q.method}`, patch: { method: undefined }, gain: sum(data?.facets.method) });
  if (q.q) out.push({ text: `Search without the words “${q.q}”`, patch: { q: undefined } });
  if (q.cwlMin || q.cwlMax) out.push({ text: 'Remove the CWL range', patch: { cwlMin: undefined, cwlMax: undefined } });
  if (q.peakMin) out.push({ text: `Accept a peak below ${pct(q.peakMin)}`, patch: { peakMin: undefined } });
  if (q.aoiMin || q.aoiMax) out.push({ text: 'Any measurement AOI', patch: { aoiMin: undefined, aoiMax: undefined } });
  if (q.fieldAngleDeg) out.push({ text: 'Look on axis (field angle 0°)', patch: { fieldAngleDeg: undefined } });
  if (q.contributor) out.push({ text: 'Curves from every contributor', patch: { contributor: undefined } });
  return out;
}

export function EmptyState(props: { query: Query; data: SearchResponse | undefined; onChange: (p: Patch) => void; hrefFor: (p: Patch) => string }) {
  const list = suggestions(props.query, props.data);
  return (
    <div className="rounded-card border border-dashed border-rule bg-panel px-5 py-6" data-testid="empty-state">
      <h2 className="font-medium">No curve matches every filter.</h2>
      {list.length ? (
        <>
          <p className="mt-1 text-sm text-muted">Loosen one of these:</p>
          <ul className="mt-3 space-y-1.5 text-sm">
            {list.map((s) => (
              <li key={s.text}>
                <a
                  href={props.hrefFor(s.patch)}
                  onClick={(e) => {
                    e.preventDefault();
                    props.onChange(s.patch);
                  }}
                  className="text-accent underline-offset-4 hover:underline"
                >
                  {s.text}
                </a>
                {s.gain ? <span className="figures ml-2 text-xs text-muted">{s.gain} curve{s.gain === 1 ? '' : 's'}</span> : null}
              </li>
            ))}
          </ul>
        </>
      ) : (
        <p className="mt-1 text-sm text-muted">The catalogue holds no verified curves yet.</p>
      )}
    </div>
  );
}

'use client';

import useSWR from 'swr';
import { useState } from 'react';
import { formatNm } from '@/components/charts/format';
import { inputClass } from '@/components/forms/field';
import { api } from '@/lib/api-client';
import type { OpticChoice } from './types';

const fetcher = api.labels.odds;

export function oddsUrl(q: { label: string; fNumber: number; obstruction: number; minThroughput: number; line: string; nEff?: number; fieldAngleDeg?: number }): string {
  const p = new URLSearchParams({ label: q.label, fNumber: String(q.fNumber), obstruction: String(q.obstruction), minThroughput: String(q.minThroughput), line: q.line });
  if (q.nEff !== undefined) p.set('nEff', String(q.nEff));
  if (q.fieldAngleDeg) p.set('fieldAngleDeg', String(q.fieldAngleDeg));
  return `/api/labels/odds?${p}`;
}

/** A short answer for a table cell: "7/9 · ≈80 %". */
export function OddsCell({ url }: { url: string }) {
  const { data, error } = useSWR(url, fetcher, { revalidateOnFocus: false });
  if (error) return <span className="text-muted">—</span>;
  if (!data) return <span className="text-muted">…</span>;
  const text = `${data.meeting}/${data.units}${data.probability === null ? '' : ` · ≈${Math.round(data.probability * 100)} %`}`;
  return (
    <span title={data.sentence} data-testid="odds-cell" data-probability={data.probability ?? ''}>
      {data.units === 0 ? '—' : text}
    </span>
  );
}

/** Beside the unit spread: the odds that a unit of this label keeps the line on the reader's optic. */
export function UnitOdds({ label, lines, optics }: { label: string; lines: { id: string; name: string }[]; optics: OpticChoice[] }) {
  const [opticId, setOpticId] = useState(optics[0] ? String(optics[0].id) : '');
  const [line, setLine] = useState(lines[0]?.id ?? 'Ha');
  const [keep, setKeep] = useState('80');
  const optic = optics.find((o) => String(o.id) === opticId);
  const min = Number(keep) / 100;
  const url = optic && Number.isFinite(min) && min >= 0 && min <= 1 ? oddsUrl({ label, fNumber: optic.fNumber, obstruction: optic.obstruction, minThroughput: min, line }) : null;
  const { data, error, isLoading } = useSWR(url, fetcher, { revalidateOnFocus: false });
  return (
    <div className="space-y-2 text-sm" data-testid="unit-odds">
      <div className="grid grid-cols-[minmax(0,1fr)_6rem_5rem] gap-2">
        <label className="space-y-1">
          <span className="block text-muted">Optic</span>
          <select className={inputClass} value={opticId} onChange={(e) => setOpticId(e.target.value)}>
            {optics.map((o) => (
              <option key={o.id} value={o.id}>
                {o.name} (f/{o.fNumber}, {o.obstruction})
              </option>
            ))}
          </select>
        </label>
        <label className="space-y-1">
          <span className="block text-muted">Line</span>
          <select className={inputClass} value={line} onChange={(e) => setLine(e.target.value)}>
            {lines.map((l) => (
              <option key={l.id} value={l.id}>
                {l.name}
              </option>
            ))}
          </select>
        </label>
        <label className="space-y-1">
          <span className="block text-muted">Keeps ≥ %</span>
          <input className={inputClass} inputMode="decimal" value={keep} onChange={(e) => setKeep(e.target.value)} />
        </label>
      </div>
      {!optics.length ? <p className="text-muted">Save an optic to see the odds on it.</p> : null}
      {error ? <p className="text-bad">{(error as Error).message}</p> : null}
      {isLoading ? <p className="text-muted">Computing…</p> : null}
      {data ? (
        <>
          <p className="font-medium" data-testid="odds-sentence">
            {data.sentence}.
          </p>
          {data.probability !== null ? (
            <p className="figures text-xs text-muted">
              Fitted: CWL normal, mean {formatNm(data.cwlSpreadNm.mean)}, sd {formatNm(data.cwlSpreadNm.sd)}; FWHM normal, mean {formatNm(data.fwhmSpreadNm.mean)}, sd{' '}
              {formatNm(data.fwhmSpreadNm.sd)} (independent). Each drawn unit is the measured unit nearest the means, stretched and moved to its CWL and FWHM,
              then run through the cone model.
            </p>
          ) : null}
        </>
      ) : null}
    </div>
  );
}

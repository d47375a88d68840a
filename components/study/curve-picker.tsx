'use client';

import { useEffect, useId, useRef, useState } from 'react';
import { formatNm } from '@/components/charts/format';
import { findLine } from '@/lib/engine/lines';
import { inRange, REQUEST_LIMITS } from '@/lib/engine/limits';
import type { StudyCurve } from '@/lib/study/types';
import type { SearchResult } from '@/lib/catalogue/search';
import { api } from '@/lib/api-client';
import { formatCurveId, parseCurveRef } from '@/lib/labels';


const lineNames = (ids: string[]) => ids.map((id) => findLine(id)?.name ?? id).join(' + ');

/** Finds catalogue curves by words through GET /api/curves, the same search the catalogue uses. */
export function CatalogueSearch({ exclude, onPick, disabled }: { exclude: number[]; onPick: (id: number) => void; disabled: boolean }) {
  const id = useId();
  const [q, setQ] = useState('');
  const [hits, setHits] = useState<SearchResult['items'] | null>(null);
  const [error, setError] = useState<string | null>(null);
  const [loading, setLoading] = useState(false);

  const text = q.trim();
  const searching = text.length >= 2;
  useEffect(() => {
    if (!searching) return;
    const ctrl = new AbortController();
    const timer = setTimeout(async () => {
      setLoading(true);
      try {
        const body = await api.curves.search(new URLSearchParams({ q: text, pageSize: '8' }).toString(), ctrl.signal);
        setHits(body.items);
        setError(null);
      } catch (e) {
        if ((e as Error).name !== 'AbortError') setError((e as Error).message);
      } finally {
        setLoading(false);
      }
    }, 250);
    return () => {
      ctrl.abort();
      clearTimeout(timer);
    };
  }, [text, searching]);
  // A typed curve id ("C-111", "#111") is offered as itself, ahead of the word search's hits.
  const typedId = text.length >= 2 && (text[0] === '#' || text[0].toUpperCase() === 'C') ? parseCurveRef(text) : null;
  const shownHits = searching ? hits : null;
  const shownError = searching ? error : null;

  return (
    <div className="space-y-2">
      <label htmlFor={id} className="block text-xs font-medium">
        Add a curve from the catalogue
      </label>
      <input
        id={id}
        type="search"
        value={q}
        disabled={disabled}
        onChange={(e) => setQ(e.target.value)}
        placeholder={disabled ? 'Four curves at most: remove one first' : 'Label, maker, line… e.g. OIII 3nm'}
        className="w-full rounded-card border border-rule bg-panel px-2 py-1.5 text-sm disabled:opacity-60"
        aria-describedby={`${id}-status`}
      />
      <p id={`${id}-status`} className="sr-only" aria-live="polite">
        {loading ? 'Searching' : shownHits ? `${shownHits.length} curves found` : ''}
      </p>
      {shownError ? <p className="text-xs text-bad">{shownError}</p> : null}
      {typedId !== null ? (
        <button type="button" disabled={disabled || exclude.includes(typedId)} onClick={() => { onPick(typedId); setQ(''); }}
          className="rounded-card border border-rule px-2 py-1 text-sm hover:border-accent disabled:opacity-50">
          Add curve {formatCurveId(typedId)}
        </button>
      ) : null}
      {shownHits ? (
        shownHits.length ? (
          <ul className="max-h-64 divide-y divide-rule/60 overflow-auto rounded-card border border-rule" aria-label="Matching curves">
            {shownHits.map((h) => {
              const taken = exclude.includes(h.id);
              return (
                <li key={h.id}>
                  <button
                    type="button"
                    disabled={taken || disabled}
                    onClick={() => {
                      onPick(h.id);
                      setQ('');
                    }}
                    className="flex w-full items-baseline gap-2 px-2 py-1.5 text-left text-sm hover:bg-accent/5 disabled:opacity-50"
                  >
                    <span className="figures shrink-0 text-xs text-muted">{formatCurveId(h.id)}</span>
                    <span className="min-w-0 flex-1 truncate">{h.label}</span>
                    <span className="figures shrink-0 text-xs text-muted">
                      {lineNames(h.lines)} {h.fwhmNm != null ? `· ${formatNm(h.fwhmNm)}` : ''}
                    </span>
                  </button>
                </li>
              );
            })}
          </ul>
        ) : (
          <p className="text-xs text-muted">No curve matches “{text}”.</p>
        )
      ) : null}
    </div>
  );
}

/** Reads pasted or uploaded data through POST /api/curves/preview, which stores nothing. */
export function PasteCurve({ onAdd, disabled, count }: { onAdd: (c: StudyCurve) => void; disabled: boolean; count: number }) {
  const id = useId();
  const [text, setText] = useState('');
  const [label, setLabel] = useState('');
  const [aoi, setAoi] = useState('0');
  const [busy, setBusy] = useState(false);
  const [error, setError] = useState<{ message: string; details: string[] } | null>(null);
  const [note, setNote] = useState<string | null>(null);
  const fileRef = useRef<HTMLInputElement>(null);

  async function read(file: Blob, name: string) {
    setBusy(true);
    setError(null);
    setNote(null);
    try {
      const res = await api.curves.preview(file, name);
      if (!res.ok) {
        const details = (res.failure.details ?? []).slice(0, 5).map((d) => (d.line ? `line ${d.line}: ${d.message}` : d.message));
        setError({ message: res.failure.error, details });
        return;
      }
      const p = res.data;
      const aoiDeg = Number(aoi.replace(',', '.'));
      const n = count + 1;
      onAdd({
        key: `p${Date.now().toString(36)}`,
        id: null,
        label: label.trim() || (name !== 'pasted.txt' ? name : `Pasted curve ${n}`),
        source: 'pasted',
        status: null,
        lines: [],
        aoiDeg: inRange(aoiDeg, REQUEST_LIMITS.measuredAoiDeg) ? aoiDeg : 0,
        nEff: null,
        tempC: null,
        cwlNm: p.metrics.cwlNm,
        fwhmNm: p.metrics.fwhmNm,
        peakT: p.metrics.peakT,
        points: p.points,
        set: null,
      });
      const a = p.assumed;
      setNote(a ? `Read ${p.points.wavelengthNm.length} points as ${a.wavelengthUnit} and ${a.transmissionUnit}${a.headerLines ? `, skipping ${a.headerLines} header line(s)` : ''}.` : null);
      setText('');
      setLabel('');
    } catch (e) {
      setError({ message: (e as Error).message, details: [] });
    } finally {
      setBusy(false);
    }
  }

  return (
    <details className="group rounded-card border border-rule">
      <summary className="cursor-pointer px-2 py-1.5 text-xs font-medium hover:text-accent">Paste or upload your own curve</summary>
      <div className="space-y-2 border-t border-rule p-2">
        <p className="text-xs leading-snug text-muted">
          Two columns, wavelength and transmission (nm, Å or µm; fraction, percent or OD). Read on the server and not stored. A link copied from this page
          carries it after the #, a part of the address browsers never send to a server.
        </p>
        <label htmlFor={`${id}-text`} className="sr-only">
          Curve data
        </label>
        <textarea
          id={`${id}-text`}
          rows={4}
          value={text}
          onChange={(e) => setText(e.target.value)}
          placeholder={'650.0, 0.012\n650.5, 0.020\n…'}
          className="figures w-full rounded-card border border-rule bg-panel px-2 py-1 text-xs"
        />
        <div className="grid grid-cols-[minmax(0,1fr)_5rem] gap-2">
          <div>
            <label htmlFor={`${id}-label`} className="block text-xs font-medium">
              Name
            </label>
            <input id={`${id}-label`} value={label} onChange={(e) => setLabel(e.target.value)} className="w-full rounded-card border border-rule bg-panel px-2 py-1 text-sm" />
          </div>
          <div>
            <label htmlFor={`${id}-aoi`} className="block text-xs font-medium">
              AOI (°)
            </label>
            <input id={`${id}-aoi`} inputMode="decimal" value={aoi} onChange={(e) => setAoi(e.target.value)} className="figures w-full rounded-card border border-rule bg-panel px-2 py-1 text-sm" />
          </div>
        </div>
        <div className="flex flex-wrap gap-2">
          <button
            type="button"
            disabled={disabled || busy || !text.trim()}
            onClick={() => read(new Blob([text], { type: 'text/plain' }), 'pasted.txt')}
            className="rounded-card bg-accent px-3 py-1 text-xs text-accent-ink disabled:opacity-50"
          >
            {busy ? 'Reading…' : 'Add pasted curve'}
          </button>
          <button
            type="button"
            disabled={disabled || busy}
            onClick={() => fileRef.current?.click()}
            className="rounded-card border border-rule px-3 py-1 text-xs hover:border-accent disabled:opacity-50"
          >
            Upload a file…
          </button>
          <input
            ref={fileRef}
            type="file"
            accept=".csv,.txt,.tsv,.dat,text/plain,text/csv"
            className="sr-only"
            tabIndex={-1}
            aria-label="Curve file"
            onChange={(e) => {
              const f = e.target.files?.[0];
              if (f) void read(f, f.name);
              e.target.value = '';
            }}
          />
        </div>
        {note ? <p className="text-xs text-ok">{note}</p> : null}
        {error ? (
          <div role="alert" className="text-xs text-bad">
            <p>{error.message}</p>
            {error.details.length ? (
              <ul className="list-disc pl-4">
                {error.details.map((d) => (
                  <li key={d}>{d}</li>
                ))}
              </ul>
            ) : null}
          </div>
        ) : null}
      </div>
    </details>
  );
}

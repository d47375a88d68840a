'use client';

import { useId, useState, type ReactNode } from 'react';
import { LINE_IDS, INSTRUMENTS } from '@/lib/schemas/submission';
import { FWHM_BUCKETS, bucketKey } from '@/lib/catalogue/search-params';
import { readQuantity } from '@/lib/catalogue/quantities';
import type { LimitedParam } from '@/lib/catalogue/limits';
import { INSTRUMENT_NAMES, bucketLabel, lineName } from './labels';
import type { Facet, OpticChoice, Query } from './types';

type Patch = Record<string, string | undefined>;

function count(facets: Facet[] | undefined, key: string): number {
  return facets?.find((f) => f.key === key)?.count ?? 0;
}

function Section({ title, children, id }: { title: string; children: ReactNode; id?: string }) {
  return (
    <fieldset className="space-y-2 border-t border-rule pt-3 first:border-t-0 first:pt-0" data-filter={id}>
      <legend className="text-xs font-semibold uppercase tracking-wider text-muted">{title}</legend>
      {children}
    </fieldset>
  );
}

/**
 * A number field that commits on Enter or when it loses focus, so typing does not fire a search per key.
 * It reads what people type ("f/2", "80 %", "40" for a 0.40 obstruction, "50 Å") by the rule the search
 * box and the API use (quantities.ts), and says at the field what it cannot use.
 */
function NumberInput(props: {
  label: string;
  value: string | undefined;
  onCommit: (v: string | undefined) => void;
  suffix?: string;
  placeholder?: string;
  name: LimitedParam;
  /** The URL holds fractions; the field shows percent. */
  percent?: boolean;
  /** What the server said is wrong with this parameter. */
  error?: string;
}) {
  const id = useId();
  const shown = (v: string | undefined) => (v === undefined || v === '' ? '' : props.percent ? String(Number((Number(v) * 100).toPrecision(6))) : v);
  const [text, setText] = useState(shown(props.value));
  const [problem, setProblem] = useState<string | null>(null);
  // When the URL changes the value (back button, "clear all"), the field follows it.
  const [seen, setSeen] = useState(props.value);
  if (seen !== props.value) {
    setSeen(props.value);
    setText(shown(props.value));
    setProblem(null);
  }
  const commit = () => {
    const t = text.trim();
    if (t === shown(props.value)) return setProblem(null);
    const r = readQuantity(props.name, t, { percentField: props.percent });
    if (r.error) return setProblem(r.error);
    setProblem(null);
    const next = r.value === null ? undefined : String(r.value);
    // "f/2" for a field holding 2: the same search, but the field shows the number it uses
    if (next === props.value) return setText(shown(props.value));
    props.onCommit(next);
  };
  const message = problem ?? props.error ?? null;
  return (
    <div className="min-w-0">
      <label htmlFor={id} className="block text-xs text-muted">
        {props.label}
      </label>
      <div className="flex items-stretch">
        <input
          id={id}
          name={props.name}
          inputMode="text"
          value={text}
          placeholder={props.placeholder}
          onChange={(e) => setText(e.target.value)}
          onBlur={commit}
          onKeyDown={(e) => {
            if (e.key === 'Enter') {
              e.preventDefault();
              commit();
            }
          }}
          aria-invalid={message ? true : undefined}
          aria-describedby={message ? `${id}-error` : undefined}
          className={`figures w-full min-w-0 rounded-l-card border bg-panel px-2 py-1 text-right text-sm ${message ? 'border-bad' : 'border-rule'} ${props.suffix ? '' : 'rounded-r-card'}`}
        />
        {props.suffix ? <span className="flex items-center rounded-r-card border border-l-0 border-rule px-1.5 text-xs text-muted">{props.suffix}</span> : null}
      </div>
      {message ? (
        <p id={`${id}-error`} role="alert" className="mt-0.5 text-xs text-bad" data-testid={`field-error-${props.name}`}>
          {message}
        </p>
      ) : null}
    </div>
  );
}

function Choice(props: { name: string; label: ReactNode; count?: number; checked: boolean; onChange: () => void; disabled?: boolean; testId?: string }) {
  return (
    <label className={`flex cursor-pointer items-center gap-2 rounded px-1 py-0.5 text-sm hover:bg-accent/5 ${props.disabled ? 'opacity-50' : ''}`} data-testid={props.testId}>
      <input type="radio" name={props.name} checked={props.checked} onChange={props.onChange} className="accent-[rgb(var(--c-accent))]" />
      <span className="min-w-0 flex-1 truncate">{props.label}</span>
      {props.count !== undefined ? <span className="figures text-xs text-muted">{props.count}</span> : null}
    </label>
  );
}

export function FilterPanel(props: {
  query: Query;
  facets?: { line: Facet[]; method: Facet[]; fwhm: Facet[] };
  optics: OpticChoice[];
  isModerator: boolean;
  signedIn: boolean;
  onChange: (patch: Patch) => void;
  /** Per parameter, what the server refused. */
  errors?: Record<string, string>;
}) {
  const { query: q, facets, onChange } = props;
  const err = (k: string) => props.errors?.[k];
  const set = (k: string) => (v: string | undefined) => onChange({ [k]: v });
  const fitnessOn = !!q.fNumber;
  const activeOptic = props.optics.find(
    (o) => String(o.fNumber) === q.fNumber && String(o.obstruction) === (q.obstruction ?? '0') && !Number(q.fieldAngleDeg ?? 0),
  );
  const lineKeys = LINE_IDS.filter((id) => count(facets?.line, id) > 0 || q.line === id);
  const chosen = (q.fwhmBucket ?? '').split(',').filter(Boolean);
  const bucketKeys = FWHM_BUCKETS.map(bucketKey).filter((k) => count(facets?.fwhm, k) > 0 || chosen.includes(k));

  return (
    <div className="space-y-4" data-testid="filter-panel">
      <Section title="Target line" id="line">
        <div role="radiogroup" aria-label="Target line" className="max-h-64 space-y-0.5 overflow-auto">
          <Choice name="line" label="Any line" checked={!q.line} onChange={() => onChange({ line: undefined })} />
          {lineKeys.map((id) => (
            <Choice key={id} name="line" label={lineName(id)} count={count(facets?.line, id)} checked={q.line === id} onChange={() => onChange({ line: id })} testId={`line-${id}`} />
          ))}
        </div>
      </Section>

      <Section title="Fitness for an optic" id="fitness">
        <p className="text-xs text-muted">Keeps curves that pass at least this share of the target line on the optic (the catalogue&apos;s first line when none is chosen).</p>
        {props.optics.length > 0 ? (
          <div>
            <label htmlFor="optic-pick" className="block text-xs text-muted">
              Optic
            </label>
            <select
              id="optic-pick"
              className="w-full rounded-card border border-rule bg-panel px-2 py-1 text-sm"
              value={activeOptic ? String(activeOptic.id) : fitnessOn ? 'custom' : ''}
              onChange={(e) => {
                const o = props.optics.find((x) => String(x.id) === e.target.value);
                if (e.target.value === '') onChange({ fNumber: undefined, obstruction: undefined, fieldAngleDeg: undefined, nEff: undefined, minThroughput: undefined, sort: q.sort === 'throughput' ? undefined : q.sort });
                // on axis, as every headline is (headline-field.ts); a field angle is typed below
                else if (o) onChange({ fNumber: String(o.fNumber), obstruction: String(o.obstruction), fieldAngleDeg: undefined });
              }}
            >
              <option value="">No optic</option>
              {fitnessOn && !activeOptic ? <option value="custom">Custom numbers (below)</option> : null}
              {props.optics.some((o) => o.mine) ? (
                <optgroup label="Your optics">
                  {props.optics.filter((o) => o.mine).map((o) => (
                    <option key={o.id} value={o.id}>{`${o.name} · f/${o.fNumber.toFixed(1)}, ${o.obstruction.toFixed(2)}`}</option>
                  ))}
                </optgroup>
              ) : null}
              <optgroup label="Example optics">
                {props.optics.filter((o) => !o.mine).map((o) => (
                  <option key={o.id} value={o.id}>{`${o.name} · f/${o.fNumber.toFixed(1)}, ${o.obstruction.toFixed(2)}`}</option>
                ))}
              </optgroup>
            </select>
          </div>
        ) : null}
        <div className="grid grid-cols-2 gap-2">
          <NumberInput name="fNumber" error={err('fNumber')} label="f-number" value={q.fNumber} onCommit={set('fNumber')} placeholder="e.g. 2.5" />
          <NumberInput name="obstruction" error={err('obstruction')} label="Obstruction" value={q.obstruction} onCommit={set('obstruction')} placeholder="e.g. 0.36" />
          <NumberInput name="nEff" error={err('nEff')} label="Effective index" value={q.nEff} onCommit={set('nEff')} placeholder="own/2.0" />
          <NumberInput name="fieldAngleDeg" error={err('fieldAngleDeg')} label="Field angle" value={q.fieldAngleDeg} onCommit={set('fieldAngleDeg')} suffix="°" placeholder="0" />
        </div>
        <NumberInput name="minThroughput" error={err('minThroughput')} label="Keeps at least" value={q.minThroughput} onCommit={set('minThroughput')} suffix="% of the line" percent placeholder="e.g. 85" />
        <p className="text-xs text-muted">Without an effective index each curve uses its own fitted value, else 2.0.</p>
      </Section>

      <Section title="FWHM" id="fwhm">
        <div className="space-y-0.5">
          {bucketKeys.map((k) => {
            const on = chosen.includes(k);
            // several buckets at once (fwhmBucket=2-3&fwhmBucket=3-4): curves in any of them
            const next = on ? chosen.filter((x) => x !== k) : [...chosen, k];
            return (
              <label key={k} className="flex cursor-pointer items-center gap-2 rounded px-1 py-0.5 text-sm hover:bg-accent/5" data-testid={`fwhm-bucket-${k}`}>
                <input type="checkbox" name="fwhmBucket" value={k} checked={on} onChange={() => onChange({ fwhmBucket: next.length ? FWHM_BUCKETS.map(bucketKey).filter((x) => next.includes(x)).join(',') : undefined })} className="accent-[rgb(var(--c-accent))]" />
                <span className="figures flex-1">{bucketLabel(k)}</span>
                <span className="figures text-xs text-muted">{count(facets?.fwhm, k)}</span>
              </label>
            );
          })}
        </div>
        <div className="grid grid-cols-2 gap-2">
          <NumberInput name="fwhmMin" error={err('fwhmMin')} label="From" value={q.fwhmMin} onCommit={set('fwhmMin')} suffix="nm" />
          <NumberInput name="fwhmMax" error={err('fwhmMax')} label="To" value={q.fwhmMax} onCommit={set('fwhmMax')} suffix="nm" />
        </div>
      </Section>

      <Section title="CWL" id="cwl">
        <div className="grid grid-cols-2 gap-2">
          <NumberInput name="cwlMin" error={err('cwlMin')} label="From" value={q.cwlMin} onCommit={set('cwlMin')} suffix="nm" />
          <NumberInput name="cwlMax" error={err('cwlMax')} label="To" value={q.cwlMax} onCommit={set('cwlMax')} suffix="nm" />
        </div>
      </Section>

      <Section title="Peak transmission" id="peak">
        <NumberInput name="peakMin" error={err('peakMin')} label="At least" value={q.peakMin} onCommit={set('peakMin')} suffix="%" percent />
      </Section>

      <Section title="Test method" id="method">
        <div role="radiogroup" aria-label="Instrument" className="space-y-0.5">
          <Choice name="method" label="Any instrument" checked={!q.method} onChange={() => onChange({ method: undefined })} />
          {INSTRUMENTS.map((m) => (
            <Choice key={m} name="method" label={INSTRUMENT_NAMES[m]} count={count(facets?.method, m)} checked={q.method === m} onChange={() => onChange({ method: m })} />
          ))}
        </div>
        <div className="grid grid-cols-2 gap-2">
          <NumberInput name="aoiMin" error={err('aoiMin')} label="Measured AOI from" value={q.aoiMin} onCommit={set('aoiMin')} suffix="°" />
          <NumberInput name="aoiMax" error={err('aoiMax')} label="to" value={q.aoiMax} onCommit={set('aoiMax')} suffix="°" />
        </div>
      </Section>

      {props.isModerator || props.signedIn ? (
        <Section title="Status" id="status">
          <select
            aria-label="Status"
            className="w-full rounded-card border border-rule bg-panel px-2 py-1 text-sm"
            value={q.status ?? ''}
            onChange={(e) => onChange({ status: e.target.value || undefined })}
          >
            <option value="">{props.isModerator ? 'All but superseded' : 'Verified and my own'}</option>
            <option value="verified">Verified</option>
            <option value="submitted">Waiting for review</option>
            <option value="changes_requested">Changes requested</option>
            <option value="rejected">Rejected</option>
            <option value="superseded">Superseded</option>
            <option value="any">Any status</option>
          </select>
          {!props.isModerator ? <p className="text-xs text-muted">Statuses other than verified show your own curves only.</p> : null}
        </Section>
      ) : null}
    </div>
  );
}

'use client';

import type { Assumed, ReaderOptions } from './preview-api';

const WL: Record<string, string> = { nm: 'nm', angstrom: 'Å (ångström)', um: 'µm' };
const TR: Record<string, string> = { fraction: 'fraction 0–1', percent: 'percent 0–100', od: 'optical density' };
const SEP: Record<string, string> = { ',': 'comma', ';': 'semicolon', '\t': 'tab', whitespace: 'spaces' };
const DEC: Record<string, string> = { '.': 'point (656.3)', ',': 'comma (656,3)' };

const selectClass = 'w-full rounded-card border border-rule bg-panel px-2 py-1 text-sm';

function Choice(props: { id: string; label: string; value: string | undefined; guess: string | undefined; words: Record<string, string>; onChange: (v: string | undefined) => void }) {
  const overridden = props.value !== undefined;
  return (
    <div className="min-w-0">
      <label htmlFor={props.id} className="block text-xs text-muted">
        {props.label}
        {overridden ? <span className="ml-1 text-accent">(your choice)</span> : null}
      </label>
      <select id={props.id} value={props.value ?? ''} onChange={(e) => props.onChange(e.target.value === '' ? undefined : e.target.value)} className={selectClass}>
        <option value="">{props.guess !== undefined ? `${props.words[props.guess] ?? props.guess} (auto)` : 'guess from the file'}</option>
        {Object.entries(props.words).map(([k, w]) => <option key={k} value={k}>{w}</option>)}
      </select>
    </div>
  );
}

const SKIPPED: Record<string, string> = { header: 'header', footer: 'footer', 'other block': 'another block of data' };

/** A count of lines at the top or the bottom of the file; empty means "as guessed". */
function LineCount(props: { id: string; label: string; value: number | undefined; guess: number | undefined; onChange: (v: number | undefined) => void }) {
  return (
    <div className="min-w-0">
      <label htmlFor={props.id} className="block text-xs text-muted">
        {props.label}
        {props.value !== undefined ? <span className="ml-1 text-accent">(your choice)</span> : null}
      </label>
      <input id={props.id} type="number" min={0} max={1000} step={1} value={props.value ?? props.guess ?? ''}
        onChange={(e) => props.onChange(e.target.value === '' ? undefined : Math.min(1000, Math.max(0, Math.floor(Number(e.target.value)))))} className={`${selectClass} figures`} />
    </div>
  );
}

/** What the reader assumed about a file, each guess overridable; changing one re-reads the file. */
export function ReaderControls(props: {
  idPrefix: string;
  assumed: Assumed | null;
  options: ReaderOptions;
  onChange: (next: ReaderOptions) => void;
  onSplitPairs?: (angles: number[]) => void;
}) {
  const { assumed, options } = props;
  const set = <K extends keyof ReaderOptions>(key: K, value: ReaderOptions[K] | undefined) => {
    const next = { ...options };
    if (value === undefined) delete next[key];
    else next[key] = value;
    props.onChange(next);
  };
  const columns = assumed?.columns ?? [];
  const columnWords = Object.fromEntries(columns.map((c, i) => [String(i), `${i + 1}: ${c}`]));
  const blockWords = Object.fromEntries(Array.from({ length: Math.max(assumed?.blocks ?? 1, options.block ?? 1) }, (_, i) => [String(i + 1), `block ${i + 1}`]));
  const skipped = assumed?.skipped ?? [];
  const pairs = assumed?.pairs ?? 0;
  const angles = assumed?.pairAngles ?? [];
  const pairWords = Object.fromEntries(
    Array.from({ length: Math.max(pairs, options.pair ?? 0) }, (_, i) => [String(i + 1), `pair ${i + 1}${angles[i] != null ? ` (${angles[i]}°)` : ''}`]),
  );
  const namedAngles = pairs >= 2 && angles.length === pairs && angles.every((a) => a !== null) ? (angles as number[]) : null;
  const id = (k: string) => `${props.idPrefix}-${k}`;
  return (
    <fieldset className="space-y-2">
      <legend className="text-sm font-medium">How the file was read <span className="font-normal text-muted">— “auto” is the reader’s guess; change any that is wrong</span></legend>
      <div className="grid grid-cols-2 gap-2 sm:grid-cols-4">
        <Choice id={id('wl')} label="Wavelength unit" value={options.wavelengthUnit} guess={assumed?.wavelengthUnit} words={WL} onChange={(v) => set('wavelengthUnit', v as ReaderOptions['wavelengthUnit'])} />
        <Choice id={id('tr')} label="Transmission unit" value={options.transmissionUnit} guess={assumed?.transmissionUnit} words={TR} onChange={(v) => set('transmissionUnit', v as ReaderOptions['transmissionUnit'])} />
        <Choice id={id('sep')} label="Separator" value={options.delimiter} guess={assumed?.delimiter} words={SEP} onChange={(v) => set('delimiter', v as ReaderOptions['delimiter'])} />
        <Choice id={id('dec')} label="Decimal mark" value={options.decimalSeparator} guess={assumed?.decimalSeparator} words={DEC} onChange={(v) => set('decimalSeparator', v as ReaderOptions['decimalSeparator'])} />
        <LineCount id={id('hdr')} label="Header lines" value={options.headerLines} guess={assumed?.headerLines} onChange={(v) => set('headerLines', v)} />
        <LineCount id={id('ftr')} label="Trailing lines to ignore" value={options.footerLines} guess={assumed?.footerLines} onChange={(v) => set('footerLines', v)} />
        {(assumed?.blocks ?? 1) > 1 || options.block !== undefined ? (
          <Choice id={id('blk')} label="Data block" value={options.block?.toString()} guess={assumed ? String(assumed.block) : undefined} words={blockWords}
            onChange={(v) => set('block', v === undefined ? undefined : Number(v))} />
        ) : null}
        {pairs >= 2 || options.pair !== undefined ? (
          <Choice id={id('pair')} label="Column pair" value={options.pair?.toString()} guess={assumed?.pair ? String(assumed.pair) : undefined} words={pairWords}
            onChange={(v) => set('pair', v === undefined ? undefined : Number(v))} />
        ) : null}
        {columns.length >= 2 || options.wavelengthColumn !== undefined || options.transmissionColumn !== undefined ? (
          <>
            <Choice id={id('wc')} label="Wavelength column" value={options.wavelengthColumn?.toString()} guess={assumed ? String(assumed.wavelengthColumn) : undefined} words={columnWords}
              onChange={(v) => set('wavelengthColumn', v === undefined ? undefined : Number(v))} />
            <Choice id={id('tc')} label="Transmission column" value={options.transmissionColumn?.toString()} guess={assumed ? String(assumed.transmissionColumn) : undefined} words={columnWords}
              onChange={(v) => set('transmissionColumn', v === undefined ? undefined : Number(v))} />
          </>
        ) : null}
      </div>
      {namedAngles && props.onSplitPairs ? (
        <p className="text-sm">
          This file holds {pairs} scans side by side, at {namedAngles.map((a) => `${a}°`).join(', ')}.{' '}
          <button type="button" onClick={() => props.onSplitPairs?.(namedAngles)} className="text-accent underline underline-offset-2">
            Read each as one curve of a set
          </button>
        </p>
      ) : null}
      {skipped.length > 0 ? (
        <p className="text-xs text-muted" data-testid={id('skipped')}>
          Left out:{' '}
          {skipped.map((k, i) => (
            <span key={i}>
              {i > 0 ? '; ' : ''}
              {k.from === k.to ? `line ${k.from}` : `lines ${k.from}–${k.to}`} ({SKIPPED[k.what]}, “{k.text}”)
            </span>
          ))}
        </p>
      ) : null}
      {Object.keys(options).length > 0 ? (
        <button type="button" onClick={() => props.onChange({})} className="text-xs text-accent underline underline-offset-2">Go back to what the reader guessed</button>
      ) : null}
    </fieldset>
  );
}

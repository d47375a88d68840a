'use client';

import type { ReactNode } from 'react';
import { CheckList } from '@/components/review/check-list';
import { inputClass } from '@/components/forms/field';
import { DerivedNumbers } from './derived-numbers';
import { ReaderControls } from './reader-controls';
import type { PreviewResult, ReaderOptions } from './preview-api';


/** A file's own measurement conditions in a set measured at several temperatures or in s and p light. */
export type FileConditions = { temperatureC?: string; polarization?: '' | 'unpolarized' | 's' | 'p' };

export type FileProblem = { message: string; lines: { line?: number; message: string }[] };

export type PreviewState =
  | { state: 'loading'; last?: PreviewResult }
  | { state: 'ok'; result: PreviewResult }
  | { state: 'error'; problem: FileProblem; status: number };

function size(bytes: number) {
  return bytes < 1024 ? `${bytes} B` : bytes < 1048576 ? `${(bytes / 1024).toFixed(1)} kB` : `${(bytes / 1048576).toFixed(2)} MB`;
}

/** Names the lines of the original file, so the contributor can open it and fix exactly those. */
export function ProblemBox({ problem, title }: { problem: FileProblem; title: string }) {
  return (
    <div role="alert" className="rounded-card border border-bad/60 bg-bad/5 p-3 text-sm" data-testid="file-problem">
      <p className="font-medium text-bad">{title}</p>
      {problem.lines.length > 0 ? <p>Fix these lines in the file, or change how it is read below:</p> : <p>{problem.message}</p>}
      {problem.lines.length > 0 ? (
        <ul className="mt-1 space-y-0.5">
          {problem.lines.map((l, i) => (
            <li key={i}>
              {l.line !== undefined ? <span className="figures mr-2 rounded bg-bad/10 px-1">line {l.line}</span> : null}
              {l.message}
            </li>
          ))}
        </ul>
      ) : null}
    </div>
  );
}

export function FileCard(props: {
  index: number;
  total: number;
  name: string;
  bytes: number;
  aoi: string;
  aoiError?: string;
  onAoi: (v: string) => void;
  /** This file's own temperature and polarisation, asked in a set of several files. */
  conditions?: FileConditions;
  conditionErrors?: { temperatureC?: string; polarization?: string };
  onConditions?: (c: FileConditions) => void;
  preview: PreviewState | undefined;
  options: ReaderOptions;
  onOptions: (o: ReaderOptions) => void;
  serverProblem?: FileProblem;
  targetLines?: string[];
  chart: (result: PreviewResult) => ReactNode;
  onRemove: () => void;
  /** Read each column pair of this file as one curve of a set, at the given angles. */
  onSplitPairs?: (angles: number[]) => void;
}) {
  const p = props.preview;
  const result = p?.state === 'ok' ? p.result : p?.state === 'loading' ? p.last : undefined;
  const idp = `file-${props.index}`;
  return (
    <article className="space-y-3 rounded-card border border-rule bg-panel p-4" aria-labelledby={`${idp}-name`} data-file={props.name}>
      <header className="flex flex-wrap items-baseline gap-x-3 gap-y-1">
        <h3 id={`${idp}-name`} className="min-w-0 break-all font-semibold">
          {props.total > 1 ? <span className="figures mr-2 text-muted">{props.index + 1}/{props.total}</span> : null}
          {props.name}
        </h3>
        <span className="figures text-xs text-muted">{size(props.bytes)}</span>
        {p?.state === 'loading' ? <span className="text-xs text-muted" role="status">reading…</span> : null}
        <button type="button" onClick={props.onRemove} className="ml-auto text-xs text-muted underline underline-offset-2 hover:text-bad">
          Remove<span className="sr-only"> {props.name}</span>
        </button>
      </header>

      <div className="flex flex-wrap items-end gap-3">
        <div className="w-40">
          <label htmlFor={`${idp}-aoi`} className="block text-sm font-medium">
            AOI<span className="text-bad" aria-label="required"> *</span>
          </label>
          <div className="flex">
            <input id={`${idp}-aoi`} type="number" step="any" min={0} max={60} inputMode="decimal" value={props.aoi} onChange={(e) => props.onAoi(e.target.value)}
              aria-invalid={!!props.aoiError} aria-describedby={`${idp}-aoi-help${props.aoiError ? ` ${idp}-aoi-error` : ''}`}
              className={`${inputClass} figures rounded-r-none`} data-testid="aoi-input" />
            <span className="flex items-center rounded-r-card border border-l-0 border-rule px-2 text-sm text-muted">°</span>
          </div>
        </div>
        <p id={`${idp}-aoi-help`} className="w-full min-w-0 text-xs text-muted sm:w-auto sm:flex-1">
          The angle between the beam and the filter normal for this measurement. The passband moves blueward with angle, so the model needs it to bring the curve back to normal incidence{props.total > 1 ? ', and the set needs one per file to fit the effective index' : ''}.
        </p>
        {props.aoiError ? <p id={`${idp}-aoi-error`} role="alert" className="w-full text-sm text-bad">{props.aoiError}</p> : null}
      </div>

      {props.total > 1 && props.onConditions ? <FileConditionsFields idp={idp} value={props.conditions ?? {}} errors={props.conditionErrors ?? {}} onChange={props.onConditions} /> : null}

      {props.serverProblem ? <ProblemBox problem={props.serverProblem} title="The server refused this file" /> : null}
      {p?.state === 'error' ? <ProblemBox problem={p.problem} title={p.status === 413 ? 'This file is too large' : 'This file could not be read'} /> : null}

      {result ? (
        <div className="grid gap-4 lg:grid-cols-[minmax(0,1fr)_18rem]">
          <div className="min-w-0">{props.chart(result)}</div>
          <div className="space-y-3">
            <DerivedNumbers metrics={result.metrics} lines={props.targetLines} />
          </div>
        </div>
      ) : null}

      <ReaderControls idPrefix={idp} assumed={result?.assumed ?? null} options={props.options} onChange={props.onOptions} onSplitPairs={props.onSplitPairs} />

      {result ? (
        <div className="space-y-2">
          <h4 className="text-sm font-medium">Automatic checks</h4>
          <CheckList checks={result.checks} caption={`Checks for ${props.name}`} />
          {result.warnings.length > 0 ? (
            <ul className="list-disc pl-5 text-xs text-muted">
              {result.warnings.map((w, i) => <li key={i}>{w}</li>)}
            </ul>
          ) : null}
        </div>
      ) : null}
    </article>
  );
}

/**
 * A set's file-by-file conditions: its measurement temperature (a set at several
 * temperatures fits dCWL/dT) and its polarisation (s and p files give separate
 * effective indices). Empty fields take the method's values below.
 */
function FileConditionsFields({ idp, value, errors, onChange }: { idp: string; value: FileConditions; errors: { temperatureC?: string; polarization?: string }; onChange: (c: FileConditions) => void }) {
  const described = (key: 'temperatureC' | 'polarization') => `${idp}-conditions-help${errors[key] ? ` ${idp}-${key}-error` : ''}`;
  return (
    <div className="flex flex-wrap items-end gap-3" data-testid="file-conditions">
      <div className="w-40">
        <label htmlFor={`${idp}-temp`} className="block text-sm font-medium">Temperature</label>
        <div className="flex">
          <input id={`${idp}-temp`} type="number" step="any" min={-60} max={80} inputMode="decimal" value={value.temperatureC ?? ''}
            onChange={(e) => onChange({ ...value, temperatureC: e.target.value })}
            aria-invalid={!!errors.temperatureC} aria-describedby={described('temperatureC')}
            className={`${inputClass} figures rounded-r-none`} data-testid="file-temp-input" />
          <span className="flex items-center rounded-r-card border border-l-0 border-rule px-2 text-sm text-muted">°C</span>
        </div>
      </div>
      <div className="w-40">
        <label htmlFor={`${idp}-pol`} className="block text-sm font-medium">Polarisation</label>
        <select id={`${idp}-pol`} value={value.polarization ?? ''} onChange={(e) => onChange({ ...value, polarization: e.target.value as FileConditions['polarization'] })}
          aria-invalid={!!errors.polarization} aria-describedby={described('polarization')} className={inputClass} data-testid="file-pol-input">
          <option value="">as the method</option>
          <option value="unpolarized">unpolarised</option>
          <option value="s">s</option>
          <option value="p">p</option>
        </select>
      </div>
      <p id={`${idp}-conditions-help`} className="w-full min-w-0 text-xs text-muted sm:w-auto sm:flex-1">
        Only where this file differs from the method below: files of one unit at two or more temperatures give its own dCWL/dT; s and p files, each at two or more angles, give separate s and p effective indices.
      </p>
      {errors.temperatureC ? <p id={`${idp}-temperatureC-error`} role="alert" className="w-full text-sm text-bad">{errors.temperatureC}</p> : null}
      {errors.polarization ? <p id={`${idp}-polarization-error`} role="alert" className="w-full text-sm text-bad">{errors.polarization}</p> : null}
    </div>
  );
}

'use client';

import type { ReactNode } from 'react';

/**
 * A compact labelled input for the study's side panel: label above, unit in a
 * suffix, help and error below. Text rather than type=number so "2." and a comma
 * decimal survive while someone is typing.
 */
export function StudyField(props: {
  id: string;
  label: string;
  value: string;
  onChange: (value: string) => void;
  suffix?: string;
  placeholder?: string;
  help?: ReactNode;
  error?: string;
  className?: string;
}) {
  const describedBy = [props.help ? `${props.id}-help` : '', props.error ? `${props.id}-error` : ''].filter(Boolean).join(' ') || undefined;
  return (
    <div className={`space-y-1 ${props.className ?? ''}`}>
      <label htmlFor={props.id} className="block text-xs font-medium text-ink">
        {props.label}
      </label>
      <div className="flex items-stretch">
        <input
          id={props.id}
          name={props.id}
          type="text"
          inputMode="decimal"
          autoComplete="off"
          spellCheck={false}
          value={props.value}
          placeholder={props.placeholder}
          onChange={(e) => props.onChange(e.target.value)}
          aria-invalid={!!props.error}
          aria-describedby={describedBy}
          className={`figures min-w-0 flex-1 border border-rule bg-panel px-2 py-1.5 text-sm aria-[invalid=true]:border-bad ${props.suffix ? 'rounded-l-card' : 'rounded-card'}`}
        />
        {props.suffix ? (
          <span className="flex items-center rounded-r-card border border-l-0 border-rule bg-paper px-2 text-xs text-muted">{props.suffix}</span>
        ) : null}
      </div>
      {props.error ? (
        <p id={`${props.id}-error`} role="alert" className="text-xs text-bad">
          {props.error}
        </p>
      ) : null}
      {props.help ? (
        <p id={`${props.id}-help`} className="text-xs leading-snug text-muted">
          {props.help}
        </p>
      ) : null}
    </div>
  );
}

export function PanelSection(props: { title: string; children: ReactNode; aside?: ReactNode }) {
  return (
    <section className="space-y-3 border-t border-rule px-4 py-4 first:border-t-0">
      <div className="flex items-baseline justify-between gap-2">
        <h2 className="text-xs font-semibold uppercase tracking-wider text-muted">{props.title}</h2>
        {props.aside}
      </div>
      {props.children}
    </section>
  );
}

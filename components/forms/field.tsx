import type { ReactNode } from 'react';

// Label above, help and error below, units in a suffix: the same everywhere.
export function Field(props: { id: string; label: string; required?: boolean; error?: string; help?: ReactNode; suffix?: string; children: ReactNode }) {
  return (
    <div className="space-y-1">
      <label htmlFor={props.id} className="block text-sm font-medium">
        {props.label}
        {props.required ? <span className="text-bad" aria-label="required"> *</span> : null}
      </label>
      <div className="flex items-stretch">
        <div className="min-w-0 flex-1">{props.children}</div>
        {props.suffix ? <span className="flex items-center rounded-r-card border border-l-0 border-rule px-2 text-sm text-muted">{props.suffix}</span> : null}
      </div>
      {props.help ? <p className="text-xs text-muted">{props.help}</p> : null}
      {props.error ? <p role="alert" id={`${props.id}-error`} className="text-sm text-bad">{props.error}</p> : null}
    </div>
  );
}

export const inputClass = 'w-full rounded-card border border-rule bg-panel px-3 py-2 aria-[invalid=true]:border-bad';
export const buttonClass = 'rounded-card bg-accent px-4 py-2 text-accent-ink disabled:opacity-60';

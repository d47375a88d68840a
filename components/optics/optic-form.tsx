'use client';

import { zodResolver } from '@hookform/resolvers/zod';
import { useEffect, useState } from 'react';
import { useForm, type FieldPath } from 'react-hook-form';
import { fixed, formatDeg, formatFNumber, formatRatio } from '@/components/charts/format';
import { api } from '@/lib/api-client';
import type { OpticView } from '@/lib/optics/store';
import { deriveOptic, OPTIC_FIELDS, opticInputSchema, type OpticRaw } from '@/lib/schemas/optics';

/**
 * Every field as the inputs hold it. Empty number fields start as '' (so a reset
 * really empties them) and read NaN once edited (valueAsNumber); both mean "not given".
 */
export type OpticFormValues = {
  name: string;
  description: string;
  apertureMm: number | '';
  focalLengthMm: number | '';
  obstructionMm: number | '';
  reducerFactor: number | '';
  fNumber: number | '';
  obstruction: number | '';
  fieldAngleDeg: number | '';
  sensorDiagonalMm: number | '';
  exitPupilDistanceMm: number | '';
};

const NUMBER_FIELDS = OPTIC_FIELDS.filter((f) => f !== 'name' && f !== 'description') as (keyof OpticFormValues & keyof OpticRaw)[];

const blank = (): OpticFormValues => ({
  name: '',
  description: '',
  apertureMm: '',
  focalLengthMm: '',
  obstructionMm: '',
  reducerFactor: '',
  fNumber: '',
  obstruction: '',
  fieldAngleDeg: '',
  sensorDiagonalMm: '',
  exitPupilDistanceMm: '',
});

/** The form's starting values for an optic: hardware as typed, derived numbers left empty so they follow the hardware. */
export function valuesOf(o: OpticView, copy = false): OpticFormValues {
  const v = blank();
  v.name = copy ? `${o.name} (my copy)`.slice(0, 120) : o.name;
  v.description = copy ? '' : (o.description ?? '');
  const n = (x: number | null): number | '' => (x == null ? '' : x);
  v.apertureMm = n(o.apertureMm);
  v.focalLengthMm = n(o.focalLengthMm);
  v.obstructionMm = n(o.obstructionMm);
  v.reducerFactor = n(o.reducerFactor);
  v.sensorDiagonalMm = n(o.sensorDiagonalMm);
  v.exitPupilDistanceMm = n(o.exitPupilDistanceMm);
  v.fNumber = o.derived.fNumber ? '' : o.fNumber;
  v.obstruction = o.derived.obstruction ? '' : o.obstruction;
  v.fieldAngleDeg = o.derived.fieldAngleDeg ? '' : o.fieldAngleDeg;
  return v;
}

function rawOf(v: OpticFormValues): OpticRaw {
  const raw: OpticRaw = { name: v.name, description: v.description || undefined };
  for (const f of NUMBER_FIELDS) {
    const x = v[f];
    if (typeof x === 'number' && Number.isFinite(x)) (raw as Record<string, unknown>)[f] = x;
  }
  return raw;
}

const input = 'figures w-full min-w-0 border border-rule bg-panel px-2 py-1.5 text-sm aria-[invalid=true]:border-bad disabled:bg-paper disabled:text-muted';
const textInput = 'w-full min-w-0 rounded-card border border-rule bg-panel px-2 py-1.5 text-sm aria-[invalid=true]:border-bad';

export function OpticForm(props: { editing: OpticView | null; start: OpticFormValues | null; onSaved: (o: OpticView) => void; onCancel: () => void }) {
  const [serverError, setServerError] = useState<string | null>(null);
  const form = useForm<OpticFormValues>({
    // The handler's schema checks the form: one set of rules and messages.
    resolver: zodResolver(opticInputSchema) as never,
    defaultValues: props.start ?? blank(),
    mode: 'onBlur',
  });
  const { register, handleSubmit, formState, reset, watch, setError } = form;
  const errors = formState.errors;

  useEffect(() => {
    reset(props.start ?? blank());
    setServerError(null);
  }, [props.start, reset]);

  const values = watch();
  const d = deriveOptic(rawOf(values));

  async function submit() {
    setServerError(null);
    const raw = rawOf(form.getValues());
    const editing = props.editing;
    // A PATCH names every field, with null for the empty ones, so clearing a field clears it.
    const body = editing ? Object.fromEntries(OPTIC_FIELDS.map((f) => [f, raw[f] ?? null])) : raw;
    const res = editing ? await api.optics.update(editing.id, body) : await api.optics.create(raw as OpticFormValues);
    if (res.ok) {
      props.onSaved(res.data);
      return;
    }
    setServerError(res.failure.error);
    for (const detail of res.failure.details ?? []) {
      if (detail.field && (OPTIC_FIELDS as string[]).includes(detail.field)) setError(detail.field as FieldPath<OpticFormValues>, { message: detail.message });
    }
  }

  const num = (name: keyof OpticFormValues, label: string, suffix: string, help?: string, disabled = false, shown?: string) => {
    const err = errors[name]?.message as string | undefined;
    const id = `optic-${name}`;
    return (
      <div className="space-y-1">
        <label htmlFor={id} className="block text-xs font-medium">
          {label}
        </label>
        <div className="flex">
          {disabled ? (
            <input id={id} className={`${input} ${suffix ? 'rounded-l-card' : 'rounded-card'}`} value={shown ?? ''} disabled readOnly aria-describedby={`${id}-help`} />
          ) : (
            <input
              id={id}
              type="number"
              step="any"
              inputMode="decimal"
              className={`${input} ${suffix ? 'rounded-l-card' : 'rounded-card'}`}
              aria-invalid={!!err}
              aria-describedby={[help ? `${id}-help` : '', err ? `${id}-error` : ''].filter(Boolean).join(' ') || undefined}
              {...register(name, { valueAsNumber: true })}
            />
          )}
          {suffix ? (
            <span className="flex w-12 shrink-0 items-center justify-center rounded-r-card border border-l-0 border-rule bg-paper text-xs text-muted">{suffix}</span>
          ) : null}
        </div>
        {err ? (
          <p id={`${id}-error`} role="alert" className="text-xs text-bad">
            {err}
          </p>
        ) : null}
        {help ? (
          <p id={`${id}-help`} className="text-xs leading-snug text-muted">
            {help}
          </p>
        ) : null}
      </div>
    );
  };

  return (
    <form onSubmit={handleSubmit(submit)} noValidate className="space-y-5" aria-label={props.editing ? `Edit ${props.editing.name}` : 'New optic'}>
      <div className="grid gap-3 sm:grid-cols-2">
        <div className="space-y-1 sm:col-span-2">
          <label htmlFor="optic-name" className="block text-xs font-medium">
            Name <span className="text-bad" aria-label="required">*</span>
          </label>
          <input id="optic-name" className={textInput} aria-invalid={!!errors.name} {...register('name')} placeholder="e.g. 200 mm astrograph with 0.8× reducer" />
          {errors.name ? <p role="alert" className="text-xs text-bad">{errors.name.message as string}</p> : null}
        </div>
        <div className="space-y-1 sm:col-span-2">
          <label htmlFor="optic-description" className="block text-xs font-medium">
            Notes
          </label>
          <input id="optic-description" className={textInput} {...register('description')} placeholder="Optional: camera, filter position…" />
        </div>
      </div>

      <fieldset className="space-y-3">
        <legend className="text-xs font-semibold uppercase tracking-wider text-muted">Light cone</legend>
        <div className="grid grid-cols-2 gap-3">
          {num('apertureMm', 'Aperture diameter', 'mm')}
          {num('focalLengthMm', 'Focal length', 'mm')}
          {num('reducerFactor', 'Reducer or corrector', '×', 'Multiplies the focal length: 0.8 for a 0.8× reducer.')}
          {num('obstructionMm', 'Obstruction diameter', 'mm', 'Secondary mirror, camera body or spider hub.')}
          {num('fNumber', 'f-number', '', d.derived.fNumber ? 'Derived from aperture and focal length.' : 'Or type it directly.', d.derived.fNumber, d.fNumber != null ? fixed(d.fNumber, 3) : '')}
          {num('obstruction', 'Obstruction ratio', '', d.derived.obstruction ? 'Derived from the two diameters.' : 'Diameter ratio, 0 to 0.9.', d.derived.obstruction, fixed(d.obstruction, 3))}
        </div>
      </fieldset>

      <fieldset className="space-y-3">
        <legend className="text-xs font-semibold uppercase tracking-wider text-muted">Field edge</legend>
        <p className="text-xs leading-snug text-muted">
          Fast non-telecentric systems tilt the whole cone at the edge of the sensor (5–20° is common). Give the chief-ray angle, or the sensor diagonal and the exit
          pupil&apos;s distance from it to derive the angle.
        </p>
        <div className="grid grid-cols-2 gap-3">
          {num('sensorDiagonalMm', 'Sensor diagonal', 'mm')}
          {num('exitPupilDistanceMm', 'Exit pupil to sensor', 'mm')}
          {num('fieldAngleDeg', 'Chief-ray angle', '°', d.derived.fieldAngleDeg ? 'atan(half-diagonal ÷ exit-pupil distance).' : '0 to 30°.', d.derived.fieldAngleDeg, fixed(d.fieldAngleDeg, 2))}
        </div>
      </fieldset>

      <div className="rounded-card border border-rule bg-paper px-3 py-2 text-sm" aria-live="polite" data-testid="optic-derived">
        <p className="text-xs font-semibold uppercase tracking-wider text-muted">What the model will use</p>
        <p className="figures mt-1">
          {d.fNumber != null ? formatFNumber(d.fNumber) : 'f/—'} · obstruction {formatRatio(d.obstruction)} · chief ray {formatDeg(d.fieldAngleDeg)}
          {d.workingFocalLengthMm != null ? ` · working focal length ${fixed(d.workingFocalLengthMm, 0)} mm` : ''}
        </p>
        {d.problems.length && formState.isSubmitted ? (
          <ul className="mt-1 list-disc pl-4 text-xs text-bad">
            {d.problems.map((p) => (
              <li key={p.field + p.message}>{p.message}</li>
            ))}
          </ul>
        ) : null}
      </div>

      {serverError ? (
        <p role="alert" className="text-sm text-bad">
          {serverError}
        </p>
      ) : null}
      <div className="flex flex-wrap gap-2">
        <button className="rounded-card bg-accent px-4 py-2 text-sm text-accent-ink disabled:opacity-60" disabled={formState.isSubmitting}>
          {props.editing ? 'Save changes' : 'Save optic'}
        </button>
        {props.editing || props.start ? (
          <button type="button" onClick={props.onCancel} className="rounded-card border border-rule px-4 py-2 text-sm hover:border-accent">
            Cancel
          </button>
        ) : null}
      </div>
    </form>
  );
}

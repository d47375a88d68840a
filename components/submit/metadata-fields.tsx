'use client';

import { useWatch, type FieldErrors, type UseFormReturn } from 'react-hook-form';
import { Field, inputClass } from '@/components/forms/field';
import { LINES } from '@/lib/engine/lines';
import { INSTRUMENTS, type SubmissionMetadataInput } from '@/lib/schemas/submission';
import { COATINGS, COATING_NAMES } from '@/lib/engine/temperature';

export type MetadataForm = SubmissionMetadataInput;

/** Empty inputs mean "not given", never 0. */
export const asNumber = (v: unknown) => (v === '' || v === null || v === undefined ? undefined : typeof v === 'number' ? v : Number(String(v).replace(',', '.')));
const asText = (v: unknown) => (v === '' || v === null ? undefined : v);

/** The error message at a dotted path such as "method.beamFNumber". */
export function errorAt(errors: FieldErrors<MetadataForm>, path: string): string | undefined {
  let node: unknown = errors;
  for (const part of path.split('.')) {
    if (node === null || typeof node !== 'object') return undefined;
    node = (node as Record<string, unknown>)[part];
  }
  const message = (node as { message?: unknown } | undefined)?.message;
  return typeof message === 'string' ? message : undefined;
}

const INSTRUMENT_WORDS: Record<(typeof INSTRUMENTS)[number], string> = {
  spectrophotometer: 'Spectrophotometer',
  spectrograph: 'Grating spectrograph',
  monochromator: 'Monochromator scan',
  other: 'Other',
};

function Section({ title, children, id }: { title: string; id: string; children: React.ReactNode }) {
  return (
    <fieldset className="space-y-4 rounded-card border border-rule bg-panel p-4" aria-labelledby={id}>
      <legend id={id} className="px-1 text-base font-semibold">{title}</legend>
      {children}
    </fieldset>
  );
}

/** The filter and its test method: the fields of docs/product.md §What a curve carries, each with its reason beside it. */
export function MetadataFields({ form, idPrefix = 'm', fileCount }: { form: UseFormReturn<MetadataForm>; idPrefix?: string; fileCount: number }) {
  const { register, formState } = form;
  const errors = formState.errors;
  const beam = useWatch({ control: form.control, name: 'method.beam' });
  const err = (path: string) => errorAt(errors, path);
  const aria = (path: string) => ({ 'aria-invalid': !!err(path), 'aria-describedby': err(path) ? `${idPrefix}-${path}-error` : undefined });
  const id = (path: string) => `${idPrefix}-${path}`;

  return (
    <div className="space-y-6">
      <Section title="The filter" id={id('filter')}>
        <div className="grid gap-4 sm:grid-cols-2">
          <Field id={id('label')} label="Label" required error={err('label')} help="Maker and model as written on the filter or its box, e.g. “Example Optics Hα 3 nm 36 mm”.">
            <input id={id('label')} {...register('label')} {...aria('label')} className={inputClass} autoComplete="off" />
          </Field>
          <Field id={id('maker')} label="Maker" error={err('maker')}>
            <input id={id('maker')} {...register('maker', { setValueAs: asText })} {...aria('maker')} className={inputClass} autoComplete="off" />
          </Field>
        </div>
        <fieldset aria-describedby={err('lines') ? id('lines-error') : undefined}>
          <legend className="text-sm font-medium">Target lines<span className="text-bad" aria-label="required"> *</span></legend>
          <div className="mt-1 flex flex-wrap gap-x-4 gap-y-1">
            {LINES.map((l) => (
              <label key={l.id} className="inline-flex items-center gap-1.5 text-sm">
                <input type="checkbox" value={l.id} {...register('lines')} className="accent-accent" />
                <span>{l.name}</span>
                <span className="figures text-xs text-muted">{l.airNm.toFixed(2)}</span>
              </label>
            ))}
          </div>
          {err('lines') ? <p role="alert" id={id('lines-error')} className="mt-1 text-sm text-bad">{err('lines')}</p> : null}
        </fieldset>
        <div className="grid gap-4 sm:grid-cols-3">
          <Field id={id('nominalCwlNm')} label="Nominal CWL" required suffix="nm" error={err('nominalCwlNm')} help="As the maker states it.">
            <input id={id('nominalCwlNm')} type="number" step="any" inputMode="decimal" {...register('nominalCwlNm', { setValueAs: asNumber })} {...aria('nominalCwlNm')} className={`${inputClass} rounded-r-none`} />
          </Field>
          <Field id={id('nominalFwhmNm')} label="Nominal FWHM" required suffix="nm" error={err('nominalFwhmNm')}>
            <input id={id('nominalFwhmNm')} type="number" step="any" inputMode="decimal" {...register('nominalFwhmNm', { setValueAs: asNumber })} {...aria('nominalFwhmNm')} className={`${inputClass} rounded-r-none`} />
          </Field>
          <Field id={id('declaredPreShiftNm')} label="Declared pre-shift" suffix="nm" error={err('declaredPreShiftNm')} help="Redward shift the maker built in for fast optics, if stated.">
            <input id={id('declaredPreShiftNm')} type="number" step="any" inputMode="decimal" {...register('declaredPreShiftNm', { setValueAs: asNumber })} {...aria('declaredPreShiftNm')} className={`${inputClass} rounded-r-none`} />
          </Field>
        </div>
        <div className="grid gap-4 sm:grid-cols-2">
          <Field id={id('serial')} label="Serial or lot" error={err('serial')} help="Tells units of the same model apart in the spread statistics.">
            <input id={id('serial')} {...register('serial', { setValueAs: asText })} {...aria('serial')} className={inputClass} autoComplete="off" />
          </Field>
          <Field id={id('sizeMm')} label="Size" error={err('sizeMm')} help="e.g. 36 mm round, 50 × 50 mm, 2 inch mounted.">
            <input id={id('sizeMm')} {...register('sizeMm', { setValueAs: asText })} {...aria('sizeMm')} className={inputClass} autoComplete="off" />
          </Field>
        </div>
        <Field id={id('notes')} label="Notes" error={err('notes')} help="Coating, substrate, mount, anything a reader should know about this unit.">
          <textarea id={id('notes')} rows={3} {...register('notes', { setValueAs: asText })} {...aria('notes')} className={inputClass} />
        </Field>
      </Section>

      <Section title="Test method" id={id('method')}>
        <p className="text-sm text-muted">A moderator compares the curve with the way it was measured, and the cone model uses the method to bring the curve back to a collimated beam at normal incidence.</p>
        <div className="grid gap-4 sm:grid-cols-2">
          <Field id={id('method.instrument')} label="Instrument" required error={err('method.instrument')} help="Different instruments blur a passband differently; the moderator judges the curve against what this one can resolve.">
            <select id={id('method.instrument')} {...register('method.instrument', { setValueAs: asText })} {...aria('method.instrument')} className={inputClass}>
              <option value="">Choose…</option>
              {INSTRUMENTS.map((i) => <option key={i} value={i}>{INSTRUMENT_WORDS[i]}</option>)}
            </select>
          </Field>
          <Field id={id('method.resolutionNm')} label="Resolution or step" required suffix="nm" error={err('method.resolutionNm')} help="A passband less than about five times the resolution comes out wider and lower than it is; the checks compare this with the FWHM and the sample step.">
            <input id={id('method.resolutionNm')} type="number" step="any" inputMode="decimal" {...register('method.resolutionNm', { setValueAs: asNumber })} {...aria('method.resolutionNm')} className={`${inputClass} rounded-r-none`} />
          </Field>
          <Field id={id('method.beam')} label="Beam" required error={err('method.beam')} help="A converging beam already averages a cone of angles, which moves the passband blueward and widens it; a collimated beam measures a single angle.">
            <select id={id('method.beam')} {...register('method.beam', { setValueAs: asText })} {...aria('method.beam')} className={inputClass}>
              <option value="">Choose…</option>
              <option value="collimated">Collimated</option>
              <option value="converging">Converging</option>
            </select>
          </Field>
          {beam === 'converging' ? (
            <Field id={id('method.beamFNumber')} label="Beam f-number (N of f/N)" required error={err('method.beamFNumber')} help="Needed for a converging beam: the cone's half-angle, arctan(1/2N), sets how much the measurement is already shifted and widened.">
              <input id={id('method.beamFNumber')} type="number" step="any" inputMode="decimal" {...register('method.beamFNumber', { setValueAs: asNumber })} {...aria('method.beamFNumber')} className={inputClass} />
            </Field>
          ) : (
            <div className="text-sm text-muted sm:pt-7">
              AOI: {fileCount > 1 ? 'set beside each file of the set above.' : 'set beside the file above.'}
              {err('method.aoiDeg') ? <p role="alert" className="text-bad">{err('method.aoiDeg')}</p> : null}
            </div>
          )}
          <Field id={id('method.temperatureC')} label="Temperature" suffix="°C" error={err('method.temperatureC')} help="Interference coatings drift with temperature, so the temperature pins the CWL: hard (sputtered) coatings about 0.002–0.005 nm per °C, soft (evaporated) ones about 0.01–0.02 nm per °C.">
            <input id={id('method.temperatureC')} type="number" step="any" inputMode="decimal" {...register('method.temperatureC', { setValueAs: asNumber })} {...aria('method.temperatureC')} className={`${inputClass} rounded-r-none`} />
          </Field>
          <Field id={id('method.coating')} label="Coating" error={err('method.coating')} help="Sets the default temperature drift a study applies: hard (sputtered) about 0.0035 nm/°C, soft (evaporated) about 0.015 nm/°C. Both are defaults, shown as such; unknown applies none.">
            <select id={id('method.coating')} {...register('method.coating', { setValueAs: asText })} {...aria('method.coating')} className={inputClass}>
              <option value="">Not known</option>
              {COATINGS.filter((c) => c !== 'unknown').map((c) => <option key={c} value={c}>{COATING_NAMES[c][0].toUpperCase() + COATING_NAMES[c].slice(1)}</option>)}
            </select>
          </Field>
          <Field id={id('method.wavelengthUncertaintyNm')} label="Wavelength-scale uncertainty" suffix="nm" error={err('method.wavelengthUncertaintyNm')} help="How far the instrument's wavelength scale may be off (standard uncertainty). Left empty, the quality check uses a stated default for the instrument kind.">
            <input id={id('method.wavelengthUncertaintyNm')} type="number" step="any" inputMode="decimal" {...register('method.wavelengthUncertaintyNm', { setValueAs: asNumber })} {...aria('method.wavelengthUncertaintyNm')} className={`${inputClass} rounded-r-none`} />
          </Field>
          <Field id={id('method.polarization')} label="Polarisation" error={err('method.polarization')} help="Off-normal, s and p light see different passbands; unpolarised is what an imaging optic delivers.">
            <select id={id('method.polarization')} {...register('method.polarization', { setValueAs: asText })} {...aria('method.polarization')} className={inputClass}>
              <option value="">Not stated</option>
              <option value="unpolarized">Unpolarised</option>
              <option value="s">s</option>
              <option value="p">p</option>
            </select>
          </Field>
          <Field id={id('method.measuredOn')} label="Date measured" error={err('method.measuredOn')} help="Coatings can age and take up moisture; the date tells whether two curves of one unit are comparable.">
            <input id={id('method.measuredOn')} type="date" {...register('method.measuredOn', { setValueAs: asText })} {...aria('method.measuredOn')} className={inputClass} />
          </Field>
          <Field id={id('method.lab')} label="Where measured" error={err('method.lab')} help="The lab or bench, so readers can weigh curves from one set-up together.">
            <input id={id('method.lab')} {...register('method.lab', { setValueAs: asText })} {...aria('method.lab')} className={inputClass} autoComplete="off" />
          </Field>
        </div>
        {beam === 'converging' ? (
          <p className="text-sm text-muted">
            AOI: {fileCount > 1 ? 'set beside each file of the set above.' : 'set beside the file above.'}
            {err('method.aoiDeg') ? <span role="alert" className="block text-bad">{err('method.aoiDeg')}</span> : null}
          </p>
        ) : null}
      </Section>

      <Section title="Licence" id={id('licence')}>
        <div className="space-y-2 text-sm">
          <label className="flex items-start gap-2">
            <input type="radio" value="CC-BY-4.0" {...register('licence')} className="mt-1 accent-accent" />
            <span><span className="font-medium">CC BY 4.0</span> — anyone may reuse the data with credit to you (the default).</span>
          </label>
          <label className="flex items-start gap-2">
            <input type="radio" value="CC0-1.0" {...register('licence')} className="mt-1 accent-accent" />
            <span><span className="font-medium">CC0 1.0</span> — public domain, no credit required.</span>
          </label>
          {err('licence') ? <p role="alert" className="text-bad">{err('licence')}</p> : null}
        </div>
      </Section>
    </div>
  );
}

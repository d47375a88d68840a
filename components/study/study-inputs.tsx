'use client';

import Link from 'next/link';
import { TargetPicker } from './target-picker';
import { formatFNumber, formatRatio, formatSignedNm, fixed } from '@/components/charts/format';
import { findLine, LINES } from '@/lib/engine/lines';
import type { StudyOutcome } from '@/lib/study/compute';
import type { StudyCurve } from '@/lib/study/types';
import { MAX_STUDY_CURVES, readLine, type OpticChoice, type QueryField, type ResolvedStudy, type StudyQuery } from '@/lib/study/url-state';
import { NEFF_RANGES_TEXT } from '@/lib/study/verdict';
import { CatalogueSearch, PasteCurve } from './curve-picker';
import { PanelSection, StudyField } from './study-field';
import { formatCurveId } from '@/lib/labels';

export type OpticOption = OpticChoice & { description: string | null; isExample: boolean; mine: boolean };

const selectClass = 'w-full rounded-card border border-rule bg-panel px-2 py-1.5 text-sm';

export interface StudyInputsProps {
  query: StudyQuery;
  setField: (field: QueryField, value: string) => void;
  update: (patch: Partial<StudyQuery>) => void;
  curves: StudyCurve[];
  loadingCurves: boolean;
  onAddCatalogue: (id: number) => void;
  onAddPasted: (c: StudyCurve) => void;
  onRemove: (c: StudyCurve) => void;
  optics: OpticOption[];
  resolved: ResolvedStudy;
  outcomes: StudyOutcome[];
  signedIn: boolean;
  colours: string[];
}

export function StudyInputs(p: StudyInputsProps) {
  const { query, resolved, setField } = p;
  const s = resolved.settings;
  const err = resolved.errors;
  const typed = resolved.opticSource === 'typed';
  const studies = p.outcomes.flatMap((o) => (o.ok ? [o.study] : []));

  const opticValue = (field: 'f' | 'obs' | 'field') => {
    if (typed) return query[field];
    const v = field === 'f' ? s.optic.fNumber : field === 'obs' ? s.optic.obstruction : s.optic.fieldAngleDeg;
    return String(Math.round(v * 1e4) / 1e4);
  };
  // Editing one number of a saved optic turns the whole optic into a typed one.
  const editOptic = (field: 'f' | 'obs' | 'field', value: string) => {
    if (typed) return setField(field, value);
    p.update({ f: opticValue('f'), obs: opticValue('obs'), field: opticValue('field'), [field]: value });
  };

  const lineRead = readLine(query.line);
  const lineMode = query.line === '' ? '' : lineRead.value && 'id' in lineRead.value ? lineRead.value.id : 'other';
  const autoLine = 'id' in s.line && query.line === '' ? findLine(s.line.id)?.name : null;

  const mine = p.optics.filter((o) => o.mine);
  const examples = p.optics.filter((o) => o.isExample);
  const selected = p.optics.find((o) => o.id === s.optic.id);

  const fwhmMax = Math.max(3, ...studies.map((st) => st.fwhm0Nm ?? 0));

  return (
    <div className="divide-y divide-rule rounded-card border border-rule bg-panel">
      <PanelSection title={`Curves (${p.curves.length} of ${MAX_STUDY_CURVES})`} aside={p.loadingCurves ? <span className="text-xs text-muted" role="status">Loading…</span> : null}>
        {p.curves.length ? (
          <ul className="space-y-1.5" aria-label="Curves in this study">
            {p.curves.map((c, i) => (
              <li key={c.key} className="flex items-start gap-2 text-sm">
                <span aria-hidden="true" className="mt-1.5 h-2.5 w-2.5 shrink-0 rounded-full" style={{ background: p.colours[i] }} />
                <span className="min-w-0 flex-1 leading-snug">
                  {c.id != null ? <span className="figures text-xs text-muted">{formatCurveId(c.id)} </span> : <span className="text-xs text-muted">pasted </span>}
                  {c.label}
                  {c.aoiDeg ? <span className="figures text-xs text-muted"> · {fixed(c.aoiDeg, 0)}° AOI</span> : null}
                </span>
                <button
                  type="button"
                  onClick={() => p.onRemove(c)}
                  className="rounded-card px-1.5 text-muted hover:text-bad"
                  aria-label={`Remove ${c.label}${c.id != null ? ` (${formatCurveId(c.id)})` : ''} from the study`}
                  title="Remove from the study"
                >
                  ×
                </button>
              </li>
            ))}
          </ul>
        ) : (
          <p className="text-sm text-muted">No curve yet. Add one below, or open any curve in the catalogue and choose “Run a cone study”.</p>
        )}
        <CatalogueSearch exclude={p.curves.flatMap((c) => (c.id != null ? [c.id] : []))} onPick={p.onAddCatalogue} disabled={p.curves.length >= MAX_STUDY_CURVES} />
        <PasteCurve onAdd={p.onAddPasted} disabled={p.curves.length >= MAX_STUDY_CURVES} count={p.curves.filter((c) => c.source === 'pasted').length} />
      </PanelSection>

      <PanelSection
        title="Optic"
        aside={
          <Link href="/optics" className="text-xs text-accent hover:underline underline-offset-4">
            {p.signedIn ? 'Your optics' : 'Save your own'}
          </Link>
        }
      >
        <div className="space-y-1">
          <label htmlFor="study-optic" className="block text-xs font-medium">
            Saved or example optic
          </label>
          <select
            id="study-optic"
            className={selectClass}
            value={typed ? 'typed' : String(s.optic.id ?? '')}
            onChange={(e) => {
              const v = e.target.value;
              if (v === 'typed') p.update({ f: opticValue('f'), obs: opticValue('obs'), field: opticValue('field') });
              else p.update({ opticId: Number(v), f: '', obs: '', field: '' });
            }}
          >
            {mine.length ? (
              <optgroup label="Your optics">
                {mine.map((o) => (
                  <option key={o.id} value={o.id}>
                    {o.name} — {formatFNumber(o.fNumber)}, {formatRatio(o.obstruction)}
                  </option>
                ))}
              </optgroup>
            ) : null}
            <optgroup label="Examples">
              {examples.map((o) => (
                <option key={o.id} value={o.id}>
                  {o.name} — {formatFNumber(o.fNumber)}, {formatRatio(o.obstruction)}
                </option>
              ))}
            </optgroup>
            <option value="typed">Typed below</option>
          </select>
          {err.optic ? <p className="text-xs text-bad">{err.optic}</p> : null}
          {!typed && selected?.description ? <p className="text-xs leading-snug text-muted">{selected.description}</p> : null}
        </div>
        <div className="grid grid-cols-3 gap-2">
          <StudyField id="study-f" label="f-number" value={opticValue('f')} onChange={(v) => editOptic('f', v)} error={err.f} />
          <StudyField id="study-obs" label="Obstruction" value={opticValue('obs')} onChange={(v) => editOptic('obs', v)} error={err.obs} />
          <StudyField id="study-field" label="Field edge" suffix="°" value={opticValue('field')} onChange={(v) => editOptic('field', v)} error={err.field} />
        </div>
        <p className="text-xs leading-snug text-muted">
          Obstruction is the diameter ratio of the central obstruction; field edge is the chief-ray angle at the corner of the sensor (fast non-telecentric systems reach
          5–20°).
        </p>
        <fieldset className="space-y-1">
          <legend className="text-xs font-medium">Ray mapping</legend>
          <div className="flex flex-wrap gap-x-4 gap-y-1 text-sm">
            {(['tangent', 'sine'] as const).map((m) => (
              <label key={m} className="inline-flex items-center gap-1.5">
                <input type="radio" name="study-map" value={m} checked={query.map === m} onChange={() => p.update({ map: m })} className="accent-[rgb(var(--c-accent))]" />
                {m === 'tangent' ? 'Tangent (most optics)' : 'Sine (aplanatic)'}
              </label>
            ))}
          </div>
        </fieldset>
      </PanelSection>

      <PanelSection title="Line and source">
        <div className="space-y-1">
          <label htmlFor="study-line" className="block text-xs font-medium">
            Target line
          </label>
          <select
            id="study-line"
            className={selectClass}
            value={lineMode}
            onChange={(e) => {
              const v = e.target.value;
              if (v === 'other') setField('line', studies[0] ? fixed(studies[0].lineNm, 2) : '656.28');
              else setField('line', v);
            }}
          >
            <option value="">{autoLine ? `The curve’s own line (${autoLine})` : 'The curve’s own line'}</option>
            {LINES.map((l) => (
              <option key={l.id} value={l.id}>
                {l.name} — {l.airNm.toFixed(2)} nm
              </option>
            ))}
            <option value="other">Any wavelength…</option>
          </select>
        </div>
        {lineMode === 'other' ? (
          <StudyField id="study-line-nm" label="Line wavelength (standard air)" suffix="nm" value={query.line} onChange={(v) => setField('line', v)} error={err.line} />
        ) : err.line ? (
          <p className="text-xs text-bad">{err.line}</p>
        ) : null}
        <TargetPicker velocity={query.v} onVelocity={(v) => setField('v', v)} />
        <StudyField
          id="study-v"
          label="Source radial velocity"
          suffix="km/s"
          value={query.v}
          placeholder="0"
          onChange={(v) => setField('v', v)}
          error={err.v}
          help="A receding source (positive) moves its lines toward the red by λ·v/c."
        />
        <StudyField
          id="study-need"
          label="Throughput you need"
          suffix="%"
          value={query.need}
          placeholder="none"
          onChange={(v) => setField('need', v)}
          error={err.need}
          help="Optional. The verdict says whether the line throughput clears it, and when its error bar reaches both sides of it."
        />
      </PanelSection>

      <PanelSection title="Filter">
        <StudyField
          id="study-n"
          label="Effective index"
          value={query.n}
          placeholder={studies.length ? studies.map((st) => fixed(st.nEff, 2)).join(' / ') : '2.00'}
          onChange={(v) => setField('n', v)}
          error={err.n}
          help={
            <>
              Empty uses each curve’s fitted value where its unit was measured at several angles, else 2.0. Typical: {NEFF_RANGES_TEXT}.
            </>
          }
        />
        <StudyField
          id="study-shift"
          label="Pre-shift"
          suffix="nm"
          value={query.shift}
          placeholder="0"
          onChange={(v) => setField('shift', v)}
          error={err.shift}
          help="Moves the measured passband toward the red (positive). The measured curve already includes whatever pre-shift its maker built in."
        />
        <input
          type="range"
          aria-label="Pre-shift slider"
          min={-Math.ceil(fwhmMax)}
          max={Math.ceil(2 * fwhmMax)}
          step={0.01}
          value={s.preShiftNm}
          onChange={(e) => setField('shift', e.target.value)}
          className="w-full accent-[rgb(var(--c-accent))]"
        />
        {studies.some((st) => st.onAxis.bestPreShift) ? (
          <div className="flex flex-wrap gap-1.5">
            {studies.map((st) =>
              st.onAxis.bestPreShift ? (
                <button
                  key={st.curve.key}
                  type="button"
                  onClick={() => setField('shift', String(st.onAxis.bestPreShift!.nm))}
                  className="figures rounded-card border border-rule px-2 py-0.5 text-xs hover:border-accent hover:text-accent"
                  title={`Best pre-shift for ${st.curve.label}`}
                >
                  Use best {formatSignedNm(st.onAxis.bestPreShift.nm)}
                  {studies.length > 1 ? ` (${st.curve.id != null ? formatCurveId(st.curve.id) : 'pasted'})` : ''}
                </button>
              ) : null,
            )}
          </div>
        ) : null}
      </PanelSection>

      <PanelSection title="Temperature">
        <div className="grid grid-cols-2 gap-2">
          <StudyField id="study-t" label="Filter temperature" suffix="°C" value={query.t} onChange={(v) => setField('t', v)} error={err.t} />
          <StudyField id="study-k" label="Coefficient" suffix="nm/°C" value={query.k} onChange={(v) => setField('k', v)} error={err.k} />
        </div>
        <StudyField
          id="study-tref"
          label="Reference temperature"
          suffix="°C"
          value={query.tref}
          placeholder={studies[0] ? fixed(studies[0].refTempC, 1) : '20'}
          onChange={(v) => setField('tref', v)}
          error={err.tref}
          help="Empty uses the temperature recorded with each measurement, else 20 °C. An empty coefficient uses the one fitted from the unit's multi-temperature set, else the default for its declared coating (hard about 0.0035, soft about 0.015 nm/°C, W. J. Smith for evaporated coatings); a curve of unknown coating needs a typed coefficient."
        />
      </PanelSection>
    </div>
  );
}

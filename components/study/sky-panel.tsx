'use client';

import { useDeferredValue, useMemo, useState } from 'react';
import { BarChart } from '@/components/charts/bar-chart';
import { fixed, formatTransmission } from '@/components/charts/format';
import { Field, inputClass } from '@/components/forms/field';
import { prepareCurve } from '@/lib/engine/curve';
import { buildPupil } from '@/lib/engine/pupil';
import { SKY_LINES, SKY_MODELS, skyStudy, type SkyModel, type SkyRequest, type SkyStudy } from '@/lib/engine/sky';
import type { CurveStudy, StudySettings } from '@/lib/study/types';

type Ref = { kind: 'none' } | { kind: 'box'; widthNm: string } | { kind: 'curve'; index: number };

/**
 * Against my sky: each curve's leakage of every sky line, the continuum it
 * accepts and its contrast gain over a reference, computed in the browser with
 * the same engine as the `sky` block of POST /api/model/cone.
 */
export function SkyPanel({ studies, settings }: { studies: CurveStudy[]; settings: StudySettings }) {
  const [modelId, setModelId] = useState('suburban');
  const [custom, setCustom] = useState<Record<string, string>>(() => ({ continuum: '1', ...Object.fromEntries(SKY_LINES.map((l) => [l.id, '0'])) }));
  const [ref, setRef] = useState<Ref>({ kind: 'box', widthNm: '12' });
  const inputs = useDeferredValue({ modelId, custom, ref });

  const rows = useMemo(() => {
    const model: string | SkyModel =
      inputs.modelId === 'custom'
        ? { continuum: Number(inputs.custom.continuum) || 0, lines: Object.fromEntries(SKY_LINES.map((l) => [l.id, Number(inputs.custom[l.id]) || 0])) }
        : inputs.modelId;
    return studies.map((st) => {
      const warnings: string[] = [];
      try {
        const pupil = buildPupil({ fNumber: settings.optic.fNumber, obstruction: settings.optic.obstruction, mapping: settings.optic.mapping });
        const params = { nEff: st.nEff, measuredAoiDeg: st.curve.aoiDeg, preShiftNm: st.totalShiftNm };
        let reference: SkyRequest['reference'];
        if (inputs.ref.kind === 'box') reference = { boxFwhmNm: Number(inputs.ref.widthNm) };
        else if (inputs.ref.kind === 'curve') {
          const other = studies[inputs.ref.index];
          if (other) reference = { points: other.curve.points, measuredAoiDeg: other.curve.aoiDeg, label: other.curve.label };
        }
        const tau = st.onAxis.lines[0]?.throughput ?? 0;
        const sky = skyStudy(prepareCurve(st.curve.points), pupil, params, st.lineNm, tau, { model, reference }, warnings);
        return { st, sky, warnings, error: null as string | null };
      } catch (e) {
        return { st, sky: null as SkyStudy | null, warnings, error: (e as Error).message };
      }
    });
  }, [studies, settings, inputs]);

  if (!studies.length) return null;
  const preset = SKY_MODELS.find((m) => m.id === modelId);
  const shown = rows.filter((r) => r.sky);

  return (
    <section aria-labelledby="sky-title" className="space-y-3 rounded-card border border-rule bg-panel p-4" data-testid="sky-panel">
      <h2 id="sky-title" className="text-lg font-semibold">
        Against your sky
      </h2>
      <p className="text-sm text-muted">
        Street lamps and airglow arrive as lines and a continuum. The table shows how much of each sky line leaks through each curve on this optic, the
        continuum each accepts (∫ T dλ of the cone-averaged curve) and the background-limited contrast gain (τ/τ_ref)/√(B/B_ref) over a reference: in a
        sky-limited exposure the noise grows as the square root of the background (the CCD signal-to-noise equation, S. B. Howell, <i>Handbook of CCD Astronomy</i>).
      </p>
      <div className="grid grid-cols-2 gap-3 sm:grid-cols-3">
        <Field id="sky-model" label="Sky">
          <select id="sky-model" className={inputClass} value={modelId} onChange={(e) => setModelId(e.target.value)}>
            {SKY_MODELS.map((m) => (
              <option key={m.id} value={m.id}>
                {m.name}
              </option>
            ))}
            <option value="custom">Typed sky</option>
          </select>
        </Field>
        <Field id="sky-ref" label="Compare with">
          <select
            id="sky-ref"
            className={inputClass}
            value={ref.kind === 'curve' ? `c${ref.index}` : ref.kind}
            onChange={(e) => {
              const v = e.target.value;
              setRef(v === 'none' ? { kind: 'none' } : v === 'box' ? { kind: 'box', widthNm: ref.kind === 'box' ? ref.widthNm : '12' } : { kind: 'curve', index: Number(v.slice(1)) });
            }}
          >
            <option value="box">An ideal box filter</option>
            {studies.map((s, i) => (
              <option key={s.curve.key} value={`c${i}`}>
                {s.curve.label}
              </option>
            ))}
            <option value="none">Nothing (no gain)</option>
          </select>
        </Field>
        {ref.kind === 'box' ? (
          <Field id="sky-box" label="Box width" suffix="nm">
            <input id="sky-box" className={inputClass} inputMode="decimal" value={ref.widthNm} onChange={(e) => setRef({ kind: 'box', widthNm: e.target.value })} />
          </Field>
        ) : null}
      </div>
      {preset ? <p className="text-xs text-muted">{preset.basis}</p> : null}
      {modelId === 'custom' ? (
        <div className="grid grid-cols-2 gap-2 sm:grid-cols-5" data-testid="sky-custom">
          <Field id="sky-c" label="Continuum per nm">
            <input id="sky-c" className={inputClass} inputMode="decimal" value={custom.continuum} onChange={(e) => setCustom((c) => ({ ...c, continuum: e.target.value }))} />
          </Field>
          {SKY_LINES.map((l) => (
            <Field key={l.id} id={`sky-${l.id}`} label={l.name}>
              <input id={`sky-${l.id}`} className={inputClass} inputMode="decimal" value={custom[l.id]} onChange={(e) => setCustom((c) => ({ ...c, [l.id]: e.target.value }))} />
            </Field>
          ))}
        </div>
      ) : null}
      {rows.map((r) =>
        r.error ? (
          <p key={r.st.curve.key} role="alert" className="text-sm text-bad">
            {r.st.curve.label}: {r.error}
          </p>
        ) : null,
      )}
      {shown.length ? (
        <>
          <div className="overflow-x-auto">
            <table className="figures w-full min-w-[20rem] text-sm" data-testid="sky-table">
              <thead>
                <tr className="border-b border-rule text-left text-muted">
                  <th className="py-1 pr-3 font-normal">Sky line</th>
                  {shown.map((r) => (
                    <th key={r.st.curve.key} className="py-1 pr-3 font-normal">
                      {r.st.curve.label}
                    </th>
                  ))}
                </tr>
              </thead>
              <tbody>
                {SKY_LINES.map((l, j) => (
                  <tr key={l.id} className="border-b border-rule/50">
                    <th scope="row" className="py-1 pr-3 text-left font-normal">
                      {l.name} nm
                    </th>
                    {shown.map((r) => {
                      const x = r.sky!.lines[j];
                      return (
                        <td key={r.st.curve.key} className="py-1 pr-3">
                          {x.isTarget ? 'your target line' : x.throughput == null ? 'not measured there' : formatTransmission(x.throughput, 2)}
                        </td>
                      );
                    })}
                  </tr>
                ))}
                <tr className="border-b border-rule/50">
                  <th scope="row" className="py-1 pr-3 text-left font-normal">
                    Continuum accepted
                  </th>
                  {shown.map((r) => (
                    <td key={r.st.curve.key} className="py-1 pr-3">
                      {fixed(r.sky!.continuumNm, 2)} nm
                    </td>
                  ))}
                </tr>
                <tr>
                  <th scope="row" className="py-1 pr-3 text-left font-semibold">
                    Contrast gain{r0Label(rows[0]?.sky)}
                  </th>
                  {shown.map((r) => (
                    <td key={r.st.curve.key} className="py-1 pr-3 font-semibold" data-testid="sky-gain">
                      {r.sky!.gain == null ? '—' : `× ${fixed(r.sky!.gain, 2)}`}
                    </td>
                  ))}
                </tr>
              </tbody>
            </table>
          </div>
          <BarChart
            title="Sky-line leakage on this optic"
            categories={SKY_LINES.map((l) => l.name)}
            series={shown.map((r) => ({ name: r.st.curve.label, values: r.sky!.lines.map((x) => (x.isTarget ? null : x.throughput)) }))}
            yName="Line leaking through (%)"
            fileName="sky-leakage"
            summary={<p>No bar means the curve was not measured that far, so its leakage there is unknown (not zero), or the sky line is your target.</p>}
          />
          {[...new Set(rows.flatMap((r) => r.warnings))].map((w) => (
            <p key={w} className="text-xs text-muted">
              {w}
            </p>
          ))}
        </>
      ) : null}
    </section>
  );
}

function r0Label(sky: SkyStudy | null | undefined): string {
  return sky?.reference ? ` over ${sky.reference.label}` : '';
}

'use client';

import Link from 'next/link';
import { useState } from 'react';
import { fixed, formatDeg, formatFNumber, formatNm, formatTransmission } from '@/components/charts/format';
import { coneRequestBody, fittedNeffUncertainty, refTempFor, tempCoeffFor } from '@/lib/study/compute';
import { COATING_NAMES, defaultTempCoeff } from '@/lib/engine/temperature';
import type { CurveStudy, StudySettings } from '@/lib/study/types';
import { verdictFor, type Tone } from '@/lib/study/verdict';
import { needVerdict, straddledMarks } from '@/lib/study/error-bar';
import { firstOrderTrust } from '@/lib/engine/first-order-designs';
import { FIRST_ORDER_TABLE } from '@/lib/engine/first-order-table';
import { formatCurveId } from '@/lib/labels';

const TONE: Record<Tone, { className: string; word: string; icon: string }> = {
  good: { className: 'text-ok border-ok', word: 'Keeps most of the line', icon: 'M3 8.5 6.5 12 13 4.5' },
  fair: { className: 'text-wait border-wait', word: 'Loses a fair part', icon: 'M3 8h10' },
  poor: { className: 'text-bad border-bad', word: 'Loses most of the line', icon: 'M4 4l8 8M12 4l-8 8' },
  neutral: { className: 'text-muted border-rule', word: '', icon: '' },
};

export function ToneBadge({ tone }: { tone: Tone }) {
  const t = TONE[tone];
  if (!t.word) return null;
  return (
    <span className={`inline-flex items-center gap-1 rounded-card border px-1.5 py-0.5 text-xs ${t.className}`}>
      <svg width="11" height="11" viewBox="0 0 16 16" aria-hidden="true">
        <path d={t.icon} fill="none" stroke="currentColor" strokeWidth="2" strokeLinecap="round" strokeLinejoin="round" />
      </svg>
      {t.word}
    </span>
  );
}

export function VerdictCard({ study, settings, colour }: { study: CurveStudy; settings: StudySettings; colour: string }) {
  const v = verdictFor(study, settings.optic, settings.preShiftNm, settings.radialVelocityKms);
  const [main, ...rest] = v.items;
  const c = study.curve;
  return (
    <article
      className="@container min-w-0 overflow-hidden rounded-card border border-rule bg-panel"
      data-testid="verdict"
      data-curve={c.key}
      aria-labelledby={`verdict-${c.key}`}
    >
      <header className="flex items-start gap-3 border-b border-rule px-4 py-3">
        <span aria-hidden="true" className="mt-1.5 h-3 w-3 shrink-0 rounded-full" style={{ background: colour }} />
        <div className="min-w-0 flex-1">
          <h3 id={`verdict-${c.key}`} className="font-semibold leading-snug">
            {c.id != null ? (
              <Link href={`/curves/${c.id}`} className="hover:text-accent hover:underline underline-offset-4">
                {c.label}
              </Link>
            ) : (
              c.label
            )}
          </h3>
          <p className="mt-0.5 text-xs font-medium text-ink" data-testid="verdict-line">
            {v.lineLabel}
          </p>
          <p className="figures mt-0.5 text-xs text-muted">
            {c.id != null ? `curve ${formatCurveId(c.id)}` : 'pasted, not stored'} · measured at {formatDeg(c.aoiDeg)} AOI
            {c.cwlNm != null ? ` · CWL ${formatNm(c.cwlNm)}` : ''}
            {c.fwhmNm != null ? ` · ${formatNm(c.fwhmNm)} FWHM` : ''}
          </p>
        </div>
      </header>

      <div className="flex flex-wrap items-end gap-x-4 gap-y-2 px-4 pb-3 pt-3">
        <p className="figures text-4xl font-semibold leading-none tracking-tight" data-testid="verdict-throughput" data-raw={main.raw ?? ''}>
          {main.value}
        </p>
        <div className="min-w-0 flex-1 space-y-1 pb-0.5">
          <ToneBadge tone={v.tone} />
          <p className="text-sm leading-snug">
            {main.text}
          </p>
        </div>
      </div>
      <p className="sr-only" data-testid="verdict-headline">
        {v.headline}
      </p>

      <dl className="border-t border-rule text-sm">
        {rest.map((item) => (
          <div
            key={item.key}
            data-key={item.key}
            data-raw={item.raw ?? ''}
            className="grid grid-cols-[minmax(0,1fr)_auto] gap-x-3 gap-y-0.5 border-b border-rule/60 px-4 py-2 last:border-b-0 @2xl:grid-cols-[10.5rem_6rem_minmax(0,1fr)]"
          >
            <dt className="text-muted">{item.label}</dt>
            <dd className={`figures text-right font-medium ${item.tone === 'poor' ? 'text-bad' : ''}`} data-testid={`verdict-${item.key}`}>
              {item.value}
            </dd>
            <dd className="col-span-2 text-xs leading-snug text-muted @2xl:col-span-1 @2xl:text-sm">{item.text}</dd>
          </div>
        ))}
      </dl>

      <ErrorBar study={study} need={settings.neededThroughput ?? null} />
      <ModelLimit study={study} settings={settings} />
      <TemperatureNote study={study} settings={settings} />

      {v.warnings.length ? (
        <ul className="space-y-1 border-t border-rule bg-paper px-4 py-2 text-xs" aria-label="Coverage and model warnings">
          {v.warnings.map((w) => (
            <li key={w} className="flex gap-2 text-wait">
              <span aria-hidden="true">▲</span>
              <span className="text-ink">
                <span className="sr-only">Warning: </span>
                {w}
              </span>
            </li>
          ))}
        </ul>
      ) : null}
      <ApiCall study={study} settings={settings} />
    </article>
  );
}

/** The line throughput's range within the curve's wavelength-scale uncertainty, and whether it straddles a verdict mark. */
function ErrorBar({ study, need }: { study: CurveStudy; need: number | null }) {
  const line = study.onAxis.lines[0];
  const range = line?.throughputRange;
  const u = study.curve.wavelengthUncertainty;
  if (!range || !u) return null;
  const [lo, hi] = range;
  const marks = straddledMarks(range);
  const against = need != null ? needVerdict(range, need) : null;
  const sn = study.nEffSource === 'fitted' ? fittedNeffUncertainty(study.curve) : null;
  return (
    <p className="border-t border-rule px-4 py-2 text-xs text-muted" data-testid="verdict-range" data-low={lo} data-high={hi}>
      <span className="figures font-medium text-ink">
        {formatTransmission(lo)} – {formatTransmission(hi)}
      </span>
      {` within ±${formatNm(u.nm)} of wavelength-scale uncertainty (${u.declared ? 'declared' : 'the default for its instrument, not declared'})`}
      {sn ? ` and ±${fixed(sn, 3)} in the fitted n_eff (its standard error from the set)` : ''}
      {'.'}
      {marks.length ? (
        <span className="block font-medium text-wait" data-testid="verdict-straddle">
          The range straddles the {marks.map((m) => `${m * 100} %`).join(' and ')} mark: within this measurement&apos;s accuracy the verdict could go either way.
        </span>
      ) : null}
      {against ? (
        <span className={`block font-medium ${against.kind === 'straddles' ? 'text-wait' : against.kind === 'clears' ? 'text-ink' : 'text-bad'}`} data-testid="verdict-need" data-kind={against.kind}>
          {against.text}
        </span>
      ) : null}
    </p>
  );
}

/** Which temperature coefficient moved this curve, and that a coating's figure is a default. */
function TemperatureNote({ study, settings }: { study: CurveStudy; settings: StudySettings }) {
  if (settings.tempC == null) return null;
  const k = tempCoeffFor(study.curve, settings);
  const ref = refTempFor(study.curve, settings).value;
  let text: string;
  if (!k) text = `Coating not known: no temperature drift applied between ${ref} °C and ${settings.tempC} °C; type a coefficient to apply one.`;
  else {
    const shift = k.value * (settings.tempC - ref);
    const from =
      k.source === 'typed'
        ? 'the typed coefficient'
        : k.source === 'fitted'
          ? "the coefficient fitted from this unit's curves at several temperatures"
          : `the default for a ${COATING_NAMES[study.curve.coating ?? 'unknown']} coating (${defaultTempCoeff(study.curve.coating)?.source}), a default rather than a measurement`;
    text = `Temperature: ${settings.tempC} °C against ${ref} °C moves the passband ${shift >= 0 ? '+' : ''}${shift.toFixed(3)} nm at ${k.value} nm/°C, ${from}.`;
  }
  return (
    <p className="border-t border-rule px-4 py-2 text-xs text-muted" data-testid="verdict-temperature">
      {text}
    </p>
  );
}

/**
 * How far the first-order figure can be trusted for this optic and curve: the
 * table of docs/model-limits.md (first order against exact multi-cavity stacks)
 * interpolated at this f-number and FWHM, for the spacer family nearest this n_eff.
 */
function ModelLimit({ study, settings }: { study: CurveStudy; settings: StudySettings }) {
  const fwhm = study.fwhm0Nm ?? study.curve.fwhmNm;
  const trust = fwhm ? firstOrderTrust(FIRST_ORDER_TABLE, { fNumber: settings.optic.fNumber, fwhmNm: fwhm, nEff: study.nEff }) : null;
  if (!trust) return null;
  const worst = Math.max(trust.over, trust.under);
  return (
    <p className="border-t border-rule px-4 py-2 text-xs text-muted" data-testid="verdict-model-limit" data-points={worst.toFixed(2)}>
      <span className="font-medium text-ink">Model limit: {trust.sentence}</span>
      {` (on axis at ${formatFNumber(settings.optic.fNumber)}, ${formatNm(fwhm)} FWHM, against exact ${trust.family}-index-spacer multi-cavity stacks${trust.clamped ? '; outside the compared range, nearest case shown' : ''}).`}
    </p>
  );
}

/** The same numbers from a script: the exact request body for POST /api/model/cone. */
function ApiCall({ study, settings }: { study: CurveStudy; settings: StudySettings }) {
  const [copied, setCopied] = useState(false);
  const body = JSON.stringify(coneRequestBody(study.curve, settings), (k, v) => (k === 'points' ? '…points…' : v));
  if (study.curve.id == null) return null;
  return (
    <details className="border-t border-rule px-4 py-2 text-xs">
      <summary className="cursor-pointer text-muted hover:text-accent">The same numbers from the API</summary>
      <div className="mt-2 space-y-2">
        <pre className="figures overflow-x-auto whitespace-pre-wrap break-all rounded-card bg-paper p-2">{`POST /api/model/cone\n${body}`}</pre>
        <button
          type="button"
          className="rounded-card border border-rule px-2 py-1 hover:border-accent hover:text-accent"
          onClick={async () => {
            const command = `curl -s -X POST ${window.location.origin}/api/model/cone -H 'content-type: application/json' -d '${body}'`;
            try {
              await navigator.clipboard.writeText(command);
              setCopied(true);
              setTimeout(() => setCopied(false), 1500);
            } catch {
              setCopied(false);
            }
          }}
        >
          {copied ? 'Copied' : 'Copy as curl'}
        </button>
      </div>
    </details>
  );
}

import { UnitOdds } from '@/components/catalogue/unit-odds';
import type { Metadata } from 'next';
import Link from 'next/link';
import { notFound } from 'next/navigation';
import { headers } from 'next/headers';
import { currentActor } from '@/lib/auth/actor';
import { HttpError } from '@/lib/http/errors';
import { getCurveDetailWithPoints, parseCurveId, type CurveDetail } from '@/lib/catalogue/detail';
import { publicOrigin } from '@/lib/http/site';
import { opticChoices } from '@/lib/catalogue/optic-choices';
import { DEFAULT_N_EFF } from '@/lib/catalogue/fitness-grid';
import { StatusBadge } from '@/components/review/status-badge';
import { StripPlot } from '@/components/charts/strip-plot';
import { formatDeg, formatFNumber, formatNm, formatRatio, formatTransmission, fixed } from '@/components/charts/format';
import { CurveChart } from '@/components/catalogue/curve-chart';
import { AddToCompare, CopyText } from '@/components/catalogue/curve-actions';
import { SolarCaution } from '@/components/catalogue/solar-caution';
import { INSTRUMENT_NAMES } from '@/components/catalogue/labels';
import { QualityList } from '@/components/review/quality-list';
import { assessCurveQuality } from '@/lib/engine/quality';
import { COATING_NAMES, defaultTempCoeff, type Coating } from '@/lib/engine/temperature';
import { BEAM_LABELS, LICENCE_SHORT, POLARIZATION_LABELS, formatCurveId, labelOf } from '@/lib/labels';

type Props = { params: Promise<{ id: string }> };

async function load(raw: string) {
  const actor = await currentActor().catch(() => null);
  try {
    const id = parseCurveId(raw);
    const h = await headers();
    const origin = publicOrigin(`${h.get('x-forwarded-proto') ?? 'http'}://${h.get('host') ?? 'localhost'}`);
    // the optics a reader may pick are read alongside the curve, not after it
    const [{ detail, points }, optics] = await Promise.all([getCurveDetailWithPoints(actor, id, origin), opticChoices(actor)]);
    return { actor, detail, points, optics };
  } catch (err) {
    if (err instanceof HttpError && err.status === 404) notFound();
    throw err;
  }
}

export async function generateMetadata({ params }: Props): Promise<Metadata> {
  const { id } = await params;
  return { title: `Curve ${id}` };
}

function Row({ label, children, testId }: { label: string; children: React.ReactNode; testId?: string }) {
  return (
    <div className="flex justify-between gap-4 border-b border-rule/60 py-1.5 last:border-b-0" data-testid={testId}>
      <dt className="text-muted">{label}</dt>
      <dd className="figures text-right">{children}</dd>
    </div>
  );
}

function Card({ title, children, className = '' }: { title: string; children: React.ReactNode; className?: string }) {
  return (
    <section className={`rounded-card border border-rule bg-panel p-4 ${className}`} aria-label={title}>
      <h2 className="mb-2 text-xs font-semibold uppercase tracking-wider text-muted">{title}</h2>
      {children}
    </section>
  );
}

const LICENCE_LINKS: Record<string, string> = {
  'CC-BY-4.0': 'https://creativecommons.org/licenses/by/4.0/',
  'CC0-1.0': 'https://creativecommons.org/publicdomain/zero/1.0/',
};

/**
 * The measuring-beam correction offered (lib/engine/quality.ts): a curve measured in a
 * converging beam sits to the blue by the bias the engine estimates, so the study
 * opens with the curve moved back by that much, as a pre-shift toward the red.
 */
function BeamCorrection({ curveId, items }: { curveId: number; items: ReturnType<typeof assessCurveQuality> }) {
  const beam = items.find((i) => i.code === 'beam' && i.correctionNm !== undefined && Math.abs(i.correctionNm) >= 0.01);
  if (!beam) return null;
  const nm = Number(beam.correctionNm!.toFixed(2));
  return (
    <p className="mt-2 text-sm" data-testid="beam-correction">
      <Link href={`/study?curve=${curveId}&shift=${nm}`} className="text-accent underline underline-offset-4">
        Study it with the beam corrected ({nm > 0 ? '+' : ''}
        {nm.toFixed(2)} nm)
      </Link>
      <span className="block text-xs text-muted">The study then applies the correction as a pre-shift toward the red; to first order only.</span>
    </p>
  );
}

function methodRows(d: CurveDetail) {
  const m = d.method as Record<string, string | number | undefined>;
  const rows: [string, string][] = [
    ['Instrument', INSTRUMENT_NAMES[d.instrument] ?? d.instrument],
    ['Resolution or step', m.resolutionNm !== undefined ? formatNm(Number(m.resolutionNm), 2) : '—'],
    ['Beam', m.beam === 'converging' ? `${BEAM_LABELS.converging} at ${formatFNumber(Number(m.beamFNumber))}` : labelOf(BEAM_LABELS, m.beam as string | undefined)],
    ['Angle of incidence', formatDeg(d.aoiDeg)],
    ['Temperature', m.temperatureC !== undefined ? `${fixed(Number(m.temperatureC), 1)} °C` : '—'],
    ['Polarisation', labelOf(POLARIZATION_LABELS, m.polarization as string | undefined)],
    ['Coating', COATING_NAMES[(m.coating as Coating | undefined) ?? 'unknown'] ?? '—'],
    [
      'Temperature drift',
      d.derived.tempCoeffNmPerC !== null
        ? `${fixed(d.derived.tempCoeffNmPerC, 4)} nm/°C (fitted)`
        : defaultTempCoeff(m.coating as Coating | undefined)
          ? `${defaultTempCoeff(m.coating as Coating)!.nmPerC} nm/°C (default for the coating)`
          : '—',
    ],
    ['Wavelength-scale uncertainty', m.wavelengthUncertaintyNm !== undefined ? `± ${formatNm(Number(m.wavelengthUncertaintyNm), 2)}` : 'not declared'],
    ['Measured on', d.measuredOn ?? '—'],
    ['Where', d.lab ?? '—'],
  ];
  return rows;
}

export default async function CurvePage({ params }: Props) {
  const { id } = await params;
  const { actor, detail: d, points, optics } = await load(id);
  const spread = d.unitSpread;
  const solar = d.lines.some((l) => l.id === 'Ha');
  const nominal = d.nominal.cwlNm && d.nominal.fwhmNm ? { cwlNm: d.nominal.cwlNm, fwhmNm: d.nominal.fwhmNm } : null;
  const contributorHref = `/curves?contributor=${d.contributor.id}`;
  const quality = assessCurveQuality(
    points,
    d.method,
    d.derived.nEff ?? DEFAULT_N_EFF,
    d.derived.tempCoeffNmPerC ?? defaultTempCoeff(d.method.coating as Coating | undefined)?.nmPerC,
  );

  return (
    <article className="space-y-5" data-testid="curve-page">
      <header className="space-y-2">
        <p className="text-sm text-muted">
          <Link href="/curves" className="underline-offset-4 hover:underline">
            Catalogue
          </Link>{' '}
          / curve {formatCurveId(d.id)}
        </p>
        <div className="flex flex-wrap items-center gap-3">
          <h1 className="text-2xl font-semibold tracking-tight">{d.title}</h1>
          <StatusBadge status={d.status} />
          <span className="text-sm text-muted">revision {d.revision}</span>
        </div>
        <p className="text-sm text-muted">
          {[d.maker, d.lines.map((l) => (/\d/.test(l.name) ? `${l.name} nm` : `${l.name} ${l.wavelengthNm.toFixed(2)} nm`)).join(', '), d.sizeMm].filter(Boolean).join(' · ')}
        </p>
        <div className="flex flex-wrap items-center gap-3 pt-1">
          <Link href={d.links.study} className="rounded-card bg-accent px-3 py-1.5 text-sm text-accent-ink" data-testid="run-study">
            Run a cone study
          </Link>
          <AddToCompare id={d.id} />
          <span className="text-sm">
            <span className="text-muted">Download:</span>{' '}
            <a href={d.links.csv} className="text-accent underline-offset-4 hover:underline" data-testid="download-csv" download>
              CSV
            </a>{' '}
            ·{' '}
            <a href={d.links.json} className="text-accent underline-offset-4 hover:underline" download>
              JSON
            </a>{' '}
            ·{' '}
            <a href={d.links.jcamp} className="text-accent underline-offset-4 hover:underline" data-testid="download-jcamp" download title="JCAMP-DX 4.24, for lab spectroscopy software">
              JCAMP-DX
            </a>{' '}
            ·{' '}
            <a href={d.links.votable} className="text-accent underline-offset-4 hover:underline" data-testid="download-votable" download title="IVOA VOTable 1.4, for astropy and TOPCAT">
              VOTable
            </a>
          </span>
        </div>
      </header>

      {solar ? <SolarCaution /> : null}

      <CurveChart
        curveId={d.id}
        title={d.title}
        points={points}
        lineIds={d.lines.map((l) => l.id)}
        nominal={nominal}
        optics={optics}
        defaultNEff={Number((d.derived.nEff ?? DEFAULT_N_EFF).toFixed(3))}
        fittedNEff={d.derived.nEff !== null}
      />

      <div className="grid gap-4 md:grid-cols-2 xl:grid-cols-3">
        <Card title="Derived numbers">
          <dl className="text-sm">
            <Row label="Peak T" testId="derived-peak">{formatTransmission(d.derived.peakT)}</Row>
            <Row label={`CWL (half-maximum centre, as measured at ${formatDeg(d.aoiDeg)})`} testId="derived-cwl">{formatNm(d.derived.cwlNm)}</Row>
            <Row label="FWHM" testId="derived-fwhm">{formatNm(d.derived.fwhmNm)}</Row>
            <Row label="Mean in-band T">{formatTransmission(d.derived.meanInBandT)}</Row>
            <Row label="Effective bandwidth">{formatNm(d.derived.effectiveBandwidthNm)}</Row>
            <Row label="Blocking (outside CWL ± 2·FWHM)">{d.derived.blockingOd === null ? '—' : `OD ${fixed(d.derived.blockingOd, 1)}`}</Row>
            <Row label="Effective index">{d.derived.nEff === null ? 'not measured (single angle)' : `${formatRatio(d.derived.nEff)} (fitted)`}</Row>
            {d.derived.nEffPolarised ? (
              <Row label="Effective index, s and p light" testId="derived-neff-sp">
                {`s ${formatRatio(d.derived.nEffPolarised.s)} · p ${formatRatio(d.derived.nEffPolarised.p)} (fitted from the polarised curves; the study averages the two)`}
              </Row>
            ) : null}
            <Row label="Samples">{d.derived.pointCount.toLocaleString('en-US')}</Row>
          </dl>
          <h3 className="mt-3 text-xs font-semibold text-muted">Transmission at catalogued lines</h3>
          <dl className="text-sm">
            {d.derived.lineTransmission
              .filter((l) => l.transmission >= 0.01 || d.lines.some((x) => x.id === l.id))
              .map((l) => (
                <Row key={l.id} label={/\d/.test(l.name) ? `${l.name} nm` : `${l.name} ${l.wavelengthNm.toFixed(2)} nm`}>
                  {formatTransmission(l.transmission)}
                </Row>
              ))}
          </dl>
          {d.nominal.cwlNm ? (
            <p className="mt-2 text-xs text-muted">
              Maker&apos;s nominal: {formatNm(d.nominal.cwlNm)} CWL, {formatNm(d.nominal.fwhmNm)} FWHM
              {d.nominal.preShiftNm ? `, declared pre-shift ${formatNm(d.nominal.preShiftNm)}` : ''}.
            </p>
          ) : null}
        </Card>

        <Card title="Test method">
          <dl className="text-sm">
            {methodRows(d).map(([k, v]) => (
              <Row key={k} label={k}>
                {v}
              </Row>
            ))}
          </dl>
          {d.set ? (
            <div className="mt-3 text-sm">
              <h3 className="text-xs font-semibold text-muted">Measured at several angles (one unit)</h3>
              <ul className="mt-1 flex flex-wrap gap-2">
                {d.set.curves.map((c) => (
                  <li key={c.id}>
                    {c.id === d.id ? (
                      <span className="figures rounded-full border border-accent px-2 py-0.5">{formatDeg(c.aoiDeg, 0)}</span>
                    ) : (
                      <Link href={`/curves/${c.id}`} className="figures rounded-full border border-rule px-2 py-0.5 hover:border-accent">
                        {formatDeg(c.aoiDeg, 0)}
                      </Link>
                    )}
                  </li>
                ))}
              </ul>
            </div>
          ) : null}
          {d.notes ? <p className="mt-3 whitespace-pre-line text-sm text-muted">{d.notes}</p> : null}
        </Card>

        <Card title="Measurement quality">
          <div data-testid="curve-quality">
            <QualityList items={quality} />
          </div>
          <BeamCorrection curveId={d.id} items={quality} />
          <p className="mt-2 text-xs text-muted">Judged from the declared method; a default stands in for anything not declared and says so.</p>
        </Card>

        <Card title="Provenance">
          <dl className="text-sm">
            <Row label="Contributor">
              <Link href={contributorHref} className="text-accent underline-offset-4 hover:underline">
                {d.contributor.name ?? 'a contributor'}
              </Link>
            </Row>
            <Row label="Lab">{d.lab ?? '—'}</Row>
            <Row label="Measured on">{d.measuredOn ?? '—'}</Row>
            <Row label="Verified">{d.verifiedAt ? d.verifiedAt.slice(0, 10) : 'not yet'}</Row>
            <Row label="Licence">
              <a href={LICENCE_LINKS[d.licence]} className="text-accent underline-offset-4 hover:underline" rel="license">
                {labelOf(LICENCE_SHORT, d.licence)}
              </a>
            </Row>
            {d.serial ? <Row label="Unit serial">{d.serial}</Row> : null}
          </dl>
          {d.revisions.length > 1 ? (
            <div className="mt-3 text-sm">
              <h3 className="text-xs font-semibold text-muted">Revisions</h3>
              <ol className="mt-1 space-y-0.5">
                {d.revisions.map((r) => (
                  <li key={r.id} className="flex items-center gap-2">
                    {r.current ? <strong>revision {r.revision}</strong> : <Link href={`/curves/${r.id}`} className="text-accent underline-offset-4 hover:underline">revision {r.revision}</Link>}
                    <StatusBadge status={r.status} />
                    {r.verifiedAt ? <span className="figures text-xs text-muted">{r.verifiedAt.slice(0, 10)}</span> : null}
                  </li>
                ))}
              </ol>
            </div>
          ) : null}
          <div className="mt-3 text-sm">
            <h3 className="text-xs font-semibold text-muted">Review</h3>
            {d.reviews.length ? (
              <ul className="mt-1 space-y-1.5" data-testid="reviews">
                {d.reviews.map((r, i) => (
                  <li key={i}>
                    <span className="figures text-xs text-muted">{r.at.slice(0, 10)}</span> {r.kind === 'verify' ? 'Verified' : r.kind.replace('_', ' ')}
                    {r.by ? ` by ${r.by}` : ''}
                    {r.note ? <>: <q>{r.note}</q></> : null}
                  </li>
                ))}
              </ul>
            ) : (
              <p className="mt-1 text-muted">No public review notes.</p>
            )}
          </div>
        </Card>

        <Card title={`Unit spread: ${spread.count} unit${spread.count === 1 ? '' : 's'} labelled “${d.label}”`} className="md:col-span-2 xl:col-span-2">
          {spread.count >= 2 ? (
            <div className="grid gap-4 sm:grid-cols-2" data-testid="unit-spread">
              {(['cwl', 'fwhm'] as const).map((k) => {
                const s = spread[k];
                const values = spread.curves.map((c) => (k === 'cwl' ? c.cwlNm : c.fwhmNm)).filter((v): v is number => v !== null);
                return (
                  <div key={k} className="space-y-1 text-sm">
                    <h3 className="font-medium">{k === 'cwl' ? 'CWL' : 'FWHM'}</h3>
                    <p className="figures">
                      mean {formatNm(s.mean)}, sd {formatNm(s.sd)}, range {formatNm(s.min)} – {formatNm(s.max)}
                    </p>
                    <StripPlot
                      values={values}
                      labels={spread.curves.filter((c) => (k === 'cwl' ? c.cwlNm : c.fwhmNm) !== null).map((c) => `curve ${formatCurveId(c.id)}`)}
                      nominal={(k === 'cwl' ? d.nominal.cwlNm : d.nominal.fwhmNm) ?? undefined}
                      label={`${k === 'cwl' ? 'CWL' : 'FWHM'} of the ${values.length} units sharing this label`}
                      width={300}
                    />
                  </div>
                );
              })}
              <p className="text-xs text-muted sm:col-span-2">
                Verified curves measured at normal incidence only (an off-normal measurement is shifted by its angle). The hollow tick is the maker&apos;s nominal value.
              </p>
            </div>
          ) : (
            <p className="text-sm text-muted">This is the only verified normal-incidence curve with this label, so there is no spread to show yet.</p>
          )}
        </Card>

        <Card title="Odds on your optic" className="md:col-span-2 xl:col-span-1">
          <UnitOdds label={d.label} lines={d.lines.map((l) => ({ id: l.id, name: l.name }))} optics={optics} />
        </Card>

        <Card title="Cite this curve">
          <p className="text-sm" data-testid="citation">
            {d.citation}
          </p>
          <div className="mt-2 flex flex-wrap items-center gap-3 text-sm">
            <CopyText text={d.citation} label="Copy citation" />
            <a href={d.links.bibtex} className="text-accent underline-offset-4 hover:underline" data-testid="cite-bibtex">
              BibTeX
            </a>
            <a href={d.links.csl} className="text-accent underline-offset-4 hover:underline" data-testid="cite-csl">
              CSL-JSON
            </a>
          </div>
          <p className="mt-2 text-xs text-muted" data-testid="cite-permanence">
            {d.status === 'verified' || d.status === 'superseded'
              ? `Revision ${d.revision} is fixed: its points, raw-file hash, method, derived numbers, licence and attribution never change. A correction becomes a new revision at its own address, so this citation keeps pointing at these numbers.`
              : 'Not yet verified: this curve may still change, so cite it only once a moderator has verified it.'}
          </p>
        </Card>
      </div>
    </article>
  );
}

import Link from 'next/link';
import { fixed, formatNm, formatTransmission, formatFNumber, MISSING } from '@/components/charts/format';
import { findLine } from '@/lib/engine/lines';
import { StatusBadge } from './status-badge';
import { BEAM_LABELS, INSTRUMENT_LABELS, LICENCE_LABELS, POLARIZATION_LABELS, formatCurveId, labelOf } from '@/lib/labels';

export type FileRow = { id: number; name: string; sizeBytes: number; sha256: string; aoiDeg: number; revision: number; createdAt: string };
export type CurveRow = {
  id: number; revision: number; status: string; aoiDeg: number; fileId: number | null; peakT: number | null; cwlNm: number | null; fwhmNm: number | null;
  meanInBandT: number | null; effectiveBandwidthNm: number | null; blockingOd: number | null; nEff: number | null; pointCount: number;
};
export type StoredMetadata = {
  label?: string; maker?: string; lines?: string[]; nominalCwlNm?: number; nominalFwhmNm?: number; declaredPreShiftNm?: number; serial?: string; sizeMm?: string;
  notes?: string; licence?: string;
  method?: { instrument?: string; resolutionNm?: number; beam?: string; beamFNumber?: number; aoiDeg?: number; temperatureC?: number; polarization?: string; measuredOn?: string; lab?: string };
  files?: { name: string; aoiDeg: number; reader?: Record<string, unknown> }[];
};

const th = 'border-b border-rule px-2 py-1.5 text-xs font-medium text-muted';
const td = 'border-b border-rule/60 px-2 py-1.5';

function kib(bytes: number) {
  return bytes < 1024 ? `${bytes} B` : `${(bytes / 1024).toFixed(1)} kB`;
}

/** The filter as declared and the test method, side by side, so a moderator reads one against the other. */
export function DeclaredFacts({ metadata }: { metadata: StoredMetadata }) {
  const m = metadata.method ?? {};
  const lines = (metadata.lines ?? []).map((id) => findLine(id)?.name ?? id).join(', ');
  const filter: [string, string][] = [
    ['Label', metadata.label ?? MISSING],
    ['Maker', metadata.maker ?? MISSING],
    ['Target lines', lines || MISSING],
    ['Nominal CWL', formatNm(metadata.nominalCwlNm)],
    ['Nominal FWHM', formatNm(metadata.nominalFwhmNm)],
    ['Declared pre-shift', metadata.declaredPreShiftNm === undefined ? 'none stated' : formatNm(metadata.declaredPreShiftNm)],
    ['Serial or lot', metadata.serial ?? MISSING],
    ['Size', metadata.sizeMm ?? MISSING],
    ['Licence', labelOf(LICENCE_LABELS, metadata.licence ?? 'CC-BY-4.0')],
  ];
  const method: [string, string][] = [
    ['Instrument', labelOf(INSTRUMENT_LABELS, m.instrument, MISSING)],
    ['Resolution or step', formatNm(m.resolutionNm, 3)],
    ['Beam', m.beam === 'converging' ? `${BEAM_LABELS.converging}, ${formatFNumber(m.beamFNumber)}` : labelOf(BEAM_LABELS, m.beam, MISSING)],
    ['AOI', metadata.files && metadata.files.length > 1 ? metadata.files.map((f) => `${fixed(f.aoiDeg, 1)}°`).join(', ') : m.aoiDeg === undefined ? MISSING : `${fixed(m.aoiDeg, 1)}°`],
    ['Temperature', m.temperatureC === undefined ? MISSING : `${fixed(m.temperatureC, 1)} °C`],
    ['Polarisation', labelOf(POLARIZATION_LABELS, m.polarization, MISSING)],
    ['Date measured', m.measuredOn ?? MISSING],
    ['Where measured', m.lab ?? MISSING],
  ];
  const list = (rows: [string, string][], testid: string) => (
    <dl className="grid grid-cols-[minmax(8rem,auto)_1fr] gap-x-4 gap-y-1 text-sm" data-testid={testid}>
      {rows.map(([k, v]) => (
        <div key={k} className="contents">
          <dt className="text-muted">{k}</dt>
          <dd className="min-w-0 break-words">{v}</dd>
        </div>
      ))}
    </dl>
  );
  return (
    <div className="grid gap-4 md:grid-cols-2">
      <section className="space-y-2 rounded-card border border-rule bg-panel p-4" aria-labelledby="facts-filter">
        <h3 id="facts-filter" className="font-semibold">The filter, as declared</h3>
        {list(filter, 'facts-filter')}
        {metadata.notes ? <p className="whitespace-pre-wrap border-t border-rule pt-2 text-sm">{metadata.notes}</p> : null}
      </section>
      <section className="space-y-2 rounded-card border border-rule bg-panel p-4" aria-labelledby="facts-method">
        <h3 id="facts-method" className="font-semibold">Test method</h3>
        {list(method, 'facts-method')}
      </section>
    </div>
  );
}

/** Every file ever uploaded for the submission, byte-for-byte, with its hash; older revisions stay listed. */
export function FilesTable({ submissionId, files, currentRevision }: { submissionId: number; files: FileRow[]; currentRevision: number }) {
  return (
    <div className="overflow-x-auto rounded-card border border-rule bg-panel">
      <table className="w-full min-w-[36rem] border-collapse text-sm" data-testid="files-table">
        <caption className="sr-only">Files as uploaded</caption>
        <thead>
          <tr className="text-left">
            <th scope="col" className={th}>File</th>
            <th scope="col" className={`${th} text-right`}>Revision</th>
            <th scope="col" className={`${th} text-right`}>AOI</th>
            <th scope="col" className={`${th} text-right`}>Size</th>
            <th scope="col" className={th}>SHA-256</th>
          </tr>
        </thead>
        <tbody>
          {[...files].sort((a, b) => b.revision - a.revision || a.aoiDeg - b.aoiDeg).map((f) => (
            <tr key={f.id} className={f.revision === currentRevision ? '' : 'text-muted'}>
              <td className={td}>
                <a href={`/api/submissions/${submissionId}/files/${f.id}`} download={f.name} className="text-accent underline underline-offset-2">{f.name}</a>
                {f.revision !== currentRevision ? <span className="ml-2 text-xs">(earlier revision)</span> : null}
              </td>
              <td className={`${td} figures text-right`}>{f.revision}</td>
              <td className={`${td} figures text-right`}>{fixed(f.aoiDeg, 1)}°</td>
              <td className={`${td} figures text-right`}>{kib(f.sizeBytes)}</td>
              <td className={`${td} figures text-xs`} title={f.sha256}>{f.sha256.slice(0, 16)}…</td>
            </tr>
          ))}
        </tbody>
      </table>
    </div>
  );
}

/** The derived numbers of each curve of the current revision, with units. */
export function CurvesTable({ curves }: { curves: CurveRow[] }) {
  const nEff = curves.find((c) => c.nEff !== null)?.nEff ?? null;
  return (
    <div className="space-y-2">
      <div className="overflow-x-auto rounded-card border border-rule bg-panel">
        <table className="w-full min-w-[44rem] border-collapse text-sm" data-testid="curves-table">
          <caption className="sr-only">Derived numbers per curve</caption>
          <thead>
            <tr className="text-left">
              <th scope="col" className={th}>Curve</th>
              <th scope="col" className={`${th} text-right`}>AOI</th>
              <th scope="col" className={`${th} text-right`}>Peak T</th>
              <th scope="col" className={`${th} text-right`}>CWL</th>
              <th scope="col" className={`${th} text-right`}>FWHM</th>
              <th scope="col" className={`${th} text-right`}>Mean in-band T</th>
              <th scope="col" className={`${th} text-right`}>Eff. bandwidth</th>
              <th scope="col" className={`${th} text-right`}>Blocking</th>
              <th scope="col" className={`${th} text-right`}>Points</th>
              <th scope="col" className={th}>Status</th>
            </tr>
          </thead>
          <tbody className="figures">
            {curves.map((c) => (
              <tr key={c.id} data-curve={c.id}>
                <td className={td}>{c.status === 'verified' ? <Link href={`/curves/${c.id}`} className="text-accent underline underline-offset-2">{formatCurveId(c.id)}</Link> : formatCurveId(c.id)}</td>
                <td className={`${td} text-right`}>{fixed(c.aoiDeg, 1)}°</td>
                <td className={`${td} text-right`}>{formatTransmission(c.peakT)}</td>
                <td className={`${td} text-right`}>{formatNm(c.cwlNm)}</td>
                <td className={`${td} text-right`}>{formatNm(c.fwhmNm)}</td>
                <td className={`${td} text-right`}>{formatTransmission(c.meanInBandT)}</td>
                <td className={`${td} text-right`}>{formatNm(c.effectiveBandwidthNm)}</td>
                <td className={`${td} text-right`}>{c.blockingOd === null ? MISSING : `OD ${fixed(c.blockingOd, 1)}`}</td>
                <td className={`${td} text-right`}>{c.pointCount}</td>
                <td className={`${td} font-sans`}><StatusBadge status={c.status} /></td>
              </tr>
            ))}
          </tbody>
        </table>
      </div>
      {nEff !== null ? (
        <p className="text-sm">
          Effective index fitted from this set: <span className="figures font-semibold" data-testid="set-neff">{fixed(nEff, 3)}</span>
        </p>
      ) : null}
    </div>
  );
}

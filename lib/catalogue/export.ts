/**
 * Bulk downloads of verified curves (GET /api/curves/export.csv and .json):
 * streamed a batch of curves at a time so a large export never sits in memory.
 */

import { QueryTypes } from 'sequelize';
import { db } from '@/db/models';
import { HttpError, unprocessable } from '@/lib/http/errors';
import { publicCatalogueSql } from '@/lib/auth/policy';
import { csvRow } from '@/lib/csv/safe';
import { citationOf } from './detail';
import { matchingVerifiedIds } from './search';
import { readCatalogue } from './read-source';
import type { SearchParams } from './search-params';

export const MAX_EXPORT_CURVES = 10_000;
const BATCH = 50;

export type ExportRow = {
  id: number; label: string; maker: string | null; lines: string[]; serial: string | null; licence: string; revision: number;
  instrument: string; aoi_deg: number; lab: string | null; measured_on: string | null; verified_at: Date | null; created_at: Date;
  cwl_nm: number | null; fwhm_nm: number | null; peak_t: number; contributor: string | null;
  wavelength_nm: number[]; transmission: number[];
};

/** One batch of an export, read on the replica when one serves (each batch chooses afresh: a stream outlives its request's first read). */
function loadBatch(ids: number[]): Promise<ExportRow[]> {
  return readCatalogue(() => readBatch(ids));
}

async function readBatch(ids: number[]): Promise<ExportRow[]> {
  const rows = await db().sequelize.query<ExportRow>(
    `SELECT c.id, c.label, c.maker, c.lines, c.serial, c.licence, c.revision, c.instrument, c.aoi_deg, c.lab, c.measured_on, c.verified_at,
            c.created_at, c.cwl_nm, c.fwhm_nm, c.peak_t, u.name AS contributor, c.wavelength_nm, c.transmission
     FROM curves c JOIN users u ON u.id = c.contributor_id WHERE c.id = ANY($1::int[]) AND ${publicCatalogueSql()}`,
    { bind: [ids], type: QueryTypes.SELECT },
  );
  const byId = new Map(rows.map((r) => [r.id, r]));
  return ids.map((id) => byId.get(id)).filter((r): r is ExportRow => !!r);
}

function citation(r: ExportRow, origin: string) {
  return citationOf(
    { id: r.id, label: r.label, serial: r.serial, revision: r.revision, licence: r.licence, measuredOn: r.measured_on, verifiedAt: r.verified_at, createdAt: r.created_at },
    r.contributor,
    origin,
  );
}

export function headerBlock(r: ExportRow, origin: string): string {
  const meta: [string, string | number | null][] = [
    ['label', r.label], ['maker', r.maker], ['lines', r.lines.join('; ')], ['serial', r.serial], ['licence', r.licence],
    ['revision', r.revision], ['contributor', r.contributor], ['lab', r.lab], ['measured_on', r.measured_on], ['instrument', r.instrument],
    ['aoi_deg', r.aoi_deg], ['cwl_nm', r.cwl_nm], ['fwhm_nm', r.fwhm_nm], ['peak_t', r.peak_t], ['citation', citation(r, origin)],
  ];
  const lines = [`# curve ${r.id}`];
  for (const [k, v] of meta) if (v !== null && v !== undefined) lines.push(csvRow([`# ${k}`, v]));
  return lines.join('\n') + '\n';
}

function rowsOf(r: ExportRow): string {
  const out: string[] = [];
  for (let i = 0; i < r.wavelength_nm.length; i++) out.push(`${r.id},${String(r.wavelength_nm[i])},${String(r.transmission[i])}`);
  return out.join('\n') + '\n';
}

async function idsFor(p: SearchParams) {
  if (p.status && p.status !== 'verified') throw unprocessable('Exports hold verified curves only; leave out status or set it to verified.', [{ field: 'status', message: 'only verified' }]);
  const { ids, total } = await matchingVerifiedIds(p, MAX_EXPORT_CURVES);
  if (total > MAX_EXPORT_CURVES) {
    throw new HttpError(413, `This export would hold ${total.toLocaleString('en-US')} curves; narrow the filters to at most ${MAX_EXPORT_CURVES.toLocaleString('en-US')}.`);
  }
  return ids;
}

function streamOf(ids: number[], head: string, each: (r: ExportRow, first: boolean) => string, tail: string): ReadableStream<Uint8Array> {
  const enc = new TextEncoder();
  let at = 0;
  let started = false;
  let first = true;
  return new ReadableStream<Uint8Array>({
    async pull(controller) {
      if (!started) {
        started = true;
        controller.enqueue(enc.encode(head));
        return;
      }
      if (at >= ids.length) {
        controller.enqueue(enc.encode(tail));
        controller.close();
        return;
      }
      const batch = await loadBatch(ids.slice(at, at + BATCH));
      at += BATCH;
      let text = '';
      for (const r of batch) {
        text += each(r, first);
        first = false;
      }
      controller.enqueue(enc.encode(text));
    },
  });
}

/** The opening lines of a bulk CSV export. */
export function exportHead(count: number, query: string): string {
  return (
    `# bandcone export: ${count} verified curve(s), long format, wavelength nm (standard air), transmission fraction 0-1\n` +
    `${csvRow(['# query', query || '(all verified curves)'])}\n` +
    `# generated,${new Date().toISOString()}\n` +
    `# each curve keeps its own licence and citation (see its block)\n` +
    'curve_id,wavelength_nm,transmission\n'
  );
}

export async function exportCsv(p: SearchParams, query: string, origin: string) {
  const ids = await idsFor(p);
  const head = exportHead(ids.length, query);
  return { count: ids.length, stream: streamOf(ids, head, (r) => headerBlock(r, origin) + rowsOf(r), '') };
}

export async function exportJson(p: SearchParams, query: string, origin: string) {
  const ids = await idsFor(p);
  const head = `{"query":${JSON.stringify(query)},"generatedAt":"${new Date().toISOString()}","count":${ids.length},"curves":[\n`;
  const each = (r: ExportRow, first: boolean) =>
    (first ? '' : ',\n') +
    JSON.stringify({
      id: r.id, label: r.label, maker: r.maker, lines: r.lines, serial: r.serial, licence: r.licence, revision: r.revision,
      contributor: r.contributor, lab: r.lab, measuredOn: r.measured_on, instrument: r.instrument, aoiDeg: r.aoi_deg,
      cwlNm: r.cwl_nm, fwhmNm: r.fwhm_nm, peakT: r.peak_t, citation: citation(r, origin),
      points: { wavelengthNm: r.wavelength_nm, transmission: r.transmission },
    });
  return { count: ids.length, stream: streamOf(ids, head, each, '\n]}\n') };
}

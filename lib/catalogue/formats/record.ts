/**
 * What the citable downloads (citation, JCAMP-DX, VOTable) say about one curve
 * revision. Built from the curve page's own detail so every format names the
 * same revision, date, contributor, lab, licence and permanent address.
 */

import type { CurveFileDetail } from '../detail';

export interface CurveRecord {
  id: number;
  revision: number;
  status: string;
  title: string;
  label: string;
  maker: string | null;
  serial: string | null;
  lines: { id: string; name: string; wavelengthNm: number }[];
  licence: string;
  contributor: string | null;
  lab: string | null;
  measuredOn: string | null;
  /** When this revision was verified (null while pending): the date a citation carries. */
  verifiedAt: string | null;
  createdAt: string;
  instrument: string;
  aoiDeg: number;
  method: Record<string, unknown>;
  derived: { peakT: number; cwlNm: number | null; fwhmNm: number | null; nEff: number | null };
  /** The permanent page of this revision: `<origin>/curves/<id>`; a new revision gets a new id. */
  url: string;
  points: { wavelengthNm: number[]; transmission: number[] };
}

export function curveRecord(d: CurveFileDetail, points: { wavelengthNm: number[]; transmission: number[] }, origin: string): CurveRecord {
  return {
    id: d.id,
    revision: d.revision,
    status: d.status,
    title: d.title,
    label: d.label,
    maker: d.maker,
    serial: d.serial,
    lines: d.lines,
    licence: d.licence,
    contributor: d.contributor.name,
    lab: d.lab,
    measuredOn: d.measuredOn,
    verifiedAt: d.verifiedAt,
    createdAt: d.createdAt,
    instrument: d.instrument,
    aoiDeg: d.aoiDeg,
    method: d.method,
    derived: { peakT: d.derived.peakT, cwlNm: d.derived.cwlNm, fwhmNm: d.derived.fwhmNm, nEff: d.derived.nEff },
    url: `${origin}/curves/${d.id}`,
    points,
  };
}

/** The date a citation gives: when this revision was verified, else when it was stored. */
export function issuedDate(r: Pick<CurveRecord, 'verifiedAt' | 'createdAt'>): string {
  return (r.verifiedAt ?? r.createdAt).slice(0, 10);
}

export const numOf = (v: unknown): number | undefined => (typeof v === 'number' && Number.isFinite(v) ? v : undefined);
export const textOf = (v: unknown): string | undefined => (typeof v === 'string' && v.length > 0 ? v : undefined);

export const LICENCE_URLS: Record<string, string> = {
  'CC-BY-4.0': 'https://creativecommons.org/licenses/by/4.0/',
  'CC0-1.0': 'https://creativecommons.org/publicdomain/zero/1.0/',
};

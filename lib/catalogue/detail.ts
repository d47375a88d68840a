/**
 * One curve as GET /api/curves/:id answers it: metadata, method, derived
 * numbers, revision chain, the public part of its review, the unit spread of
 * curves sharing its label, and a citation line.
 */

import { parseId } from '@/lib/http/ids';
import { QueryTypes } from 'sequelize';
import { db } from '@/db/models';
import type { Curve } from '@/db/models/curve';
import type { Actor } from '@/lib/auth/actor';
import { findLine } from '@/lib/engine/lines';
import type { CurvePoints } from '@/lib/engine/types';
import { unitSpread, type UnitSpread } from '@/lib/engine/spread';
import { oneCurvePerUnit, UNIT_ATTRIBUTES } from './units';
import { loadReadableCurve, readableWhere } from './points';
import { readCatalogue } from './read-source';

export function parseCurveId(raw: string): number {
  return parseId(raw, 'curve');
}

export interface CurveDetail {
  id: number;
  title: string;
  label: string;
  maker: string | null;
  lines: { id: string; name: string; wavelengthNm: number }[];
  status: string;
  revision: number;
  licence: string;
  nominal: { cwlNm: number | null; fwhmNm: number | null; preShiftNm: number | null };
  serial: string | null;
  sizeMm: string | null;
  notes: string | null;
  method: Record<string, unknown>;
  instrument: string;
  aoiDeg: number;
  lab: string | null;
  measuredOn: string | null;
  derived: {
    peakT: number;
    cwlNm: number | null;
    fwhmNm: number | null;
    meanInBandT: number | null;
    effectiveBandwidthNm: number | null;
    blockingOd: number | null;
    nEff: number | null;
    /** s and p effective indices of a set measured in polarised light (docs/model.md §Polarised sets). */
    nEffPolarised: { s: number; p: number } | null;
    /** dCWL/dT fitted from the unit's curves at several temperatures, nm/°C. */
    tempCoeffNmPerC: number | null;
    pointCount: number;
    lineTransmission: { id: string; name: string; wavelengthNm: number; transmission: number }[];
  };
  contributor: { id: string; name: string | null };
  submissionId: number | null;
  verifiedAt: string | null;
  createdAt: string;
  set: { key: string; curves: { id: number; aoiDeg: number; cwlNm: number | null; fwhmNm: number | null }[] } | null;
  revisions: { id: number; revision: number; status: string; verifiedAt: string | null; current: boolean }[];
  reviews: { kind: string; note: string; at: string; by: string | null }[];
  unitSpread: UnitSpread & { curves: { id: number; cwlNm: number | null; fwhmNm: number | null }[]; normalIncidenceOnly: true };
  citation: string;
  links: { self: string; page: string; points: string; csv: string; json: string; study: string; bibtex: string; csl: string; jcamp: string; votable: string };
}

const iso = (d: Date | string | null | undefined) => (d ? new Date(d).toISOString() : null);

export function curveTitle(c: { label: string; serial: string | null; aoiDeg: number }): string {
  const parts = [c.serial ? `unit ${c.serial}` : null, c.aoiDeg > 0 ? `measured at ${c.aoiDeg}° AOI` : null].filter(Boolean);
  return parts.length ? `${c.label} (${parts.join(', ')})` : c.label;
}

export function citationOf(c: Pick<Curve, 'id' | 'label' | 'serial' | 'revision' | 'licence' | 'measuredOn' | 'verifiedAt' | 'createdAt'>, contributor: string | null, origin: string): string {
  const year = (c.measuredOn ?? iso(c.verifiedAt) ?? iso(c.createdAt) ?? '').slice(0, 4);
  const unit = c.serial ? `, unit ${c.serial}` : '';
  return `${contributor ?? 'Anonymous contributor'} (${year}). ${c.label}${unit}: measured transmission curve, revision ${c.revision}. Bandcone curve ${c.id}, ${c.licence}. ${origin}/curves/${c.id}`;
}

/** The revisions this curve belongs to: follow replaces_curve_id both ways. */
async function revisionChain(actor: Actor | null, curve: Curve) {
  const { sequelize } = db();
  const rows = await sequelize.query<{ id: number }>(
    `WITH RECURSIVE back AS (
       SELECT id, replaces_curve_id FROM curves WHERE id = $1
       UNION SELECT c.id, c.replaces_curve_id FROM curves c JOIN back b ON c.id = b.replaces_curve_id
     ), fwd AS (
       SELECT id FROM curves WHERE id = $1
       UNION SELECT c.id FROM curves c JOIN fwd f ON c.replaces_curve_id = f.id
     )
     SELECT id FROM back UNION SELECT id FROM fwd`,
    { bind: [curve.id], type: QueryTypes.SELECT },
  );
  const { Curve: C } = db();
  const visible = await C.findAll({ where: { id: rows.map((r) => r.id), ...readableWhere(actor) }, attributes: ['id', 'revision', 'status', 'verifiedAt'], order: [['revision', 'ASC'], ['id', 'ASC']] });
  return visible.map((v) => ({ id: v.id, revision: v.revision, status: v.status, verifiedAt: iso(v.verifiedAt), current: v.id === curve.id }));
}

export function getCurveDetail(actor: Actor | null, id: number, origin: string): Promise<CurveDetail> {
  return readCatalogue(async () => detailOf(actor, await loadReadableCurve(actor, id, false), origin));
}

/** The detail and the samples of one readable curve, from one read of its row (pages and downloads that show both). */
export function getCurveDetailWithPoints(actor: Actor | null, id: number, origin: string): Promise<{ detail: CurveDetail; points: CurvePoints }> {
  return readCatalogue(async () => {
    const curve = await loadReadableCurve(actor, id, true);
    return { detail: await detailOf(actor, curve, origin), points: { wavelengthNm: curve.wavelengthNm, transmission: curve.transmission } };
  });
}

/** What a downloaded file says about its curve: the curve's own row and its contributor, without the page's neighbourhood. */
export type CurveFileDetail = Omit<CurveDetail, 'set' | 'revisions' | 'reviews' | 'unitSpread'>;

/**
 * The description and samples a download writes (CSV, the citable formats), from the curve's row
 * and its contributor's name: two reads, where the page's detail needs seven.
 */
export function getCurveFileWithPoints(actor: Actor | null, id: number, origin: string): Promise<{ detail: CurveFileDetail; points: CurvePoints }> {
  return readCatalogue(async () => {
    const curve = await loadReadableCurve(actor, id, true);
    const contributor = await contributorName(curve);
    return { detail: ownDetail(curve, contributor, origin), points: { wavelengthNm: curve.wavelengthNm, transmission: curve.transmission } };
  });
}

async function contributorName(curve: Curve): Promise<string | null> {
  const user = await db().User.findByPk(curve.contributorId, { attributes: ['id', 'name'] });
  return user?.name ?? null;
}

async function detailOf(actor: Actor | null, curve: Curve, origin: string): Promise<CurveDetail> {
  const { Curve: C, User, Review } = db();
  const [name, siblings, sameLabel, reviews, revisions] = await Promise.all([
    contributorName(curve),
    curve.setKey
      ? C.findAll({ where: { setKey: curve.setKey, revision: curve.revision, ...readableWhere(actor) }, attributes: ['id', 'aoiDeg', 'cwlNm', 'fwhmNm'], order: [['aoiDeg', 'ASC']] })
      : Promise.resolve([]),
    // off-normal measurements are shifted by their angle, so the spread compares normal-incidence units only
    C.findAll({ where: { label: curve.label, status: 'verified', aoiDeg: 0 }, attributes: ['id', 'cwlNm', 'fwhmNm', ...UNIT_ATTRIBUTES], order: [['id', 'ASC']], limit: 500 }).then(oneCurvePerUnit),
    curve.submissionId
      ? Review.findAll({ where: { submissionId: curve.submissionId, isPublic: true }, include: [{ model: User, as: 'author', attributes: ['name'] }], order: [['createdAt', 'ASC']] })
      : Promise.resolve([]),
    revisionChain(actor, curve),
  ]);
  const spread = unitSpread(sameLabel.map((s) => ({ cwlNm: s.cwlNm, fwhmNm: s.fwhmNm })));
  return {
    ...ownDetail(curve, name, origin),
    set: curve.setKey ? { key: curve.setKey, curves: siblings.map((s) => ({ id: s.id, aoiDeg: s.aoiDeg, cwlNm: s.cwlNm, fwhmNm: s.fwhmNm })) } : null,
    revisions,
    reviews: reviews.map((r) => ({
      kind: r.kind,
      note: r.body,
      at: iso(r.createdAt)!,
      by: (r as unknown as { author?: { name: string | null } }).author?.name ?? null,
    })),
    unitSpread: { ...spread, curves: sameLabel.map((s) => ({ id: s.id, cwlNm: s.cwlNm, fwhmNm: s.fwhmNm })), normalIncidenceOnly: true },
  };
}

function ownDetail(curve: Curve, name: string | null, origin: string): CurveFileDetail {
  const lineInfo = (lid: string) => {
    const l = findLine(lid);
    return { id: lid, name: l?.name ?? lid, wavelengthNm: l?.airNm ?? NaN };
  };
  const lt = curve.lineTransmission ?? {};
  return {
    id: curve.id,
    title: curveTitle(curve),
    label: curve.label,
    maker: curve.maker,
    lines: curve.lines.map(lineInfo),
    status: curve.status,
    revision: curve.revision,
    licence: curve.licence,
    nominal: { cwlNm: curve.nominalCwlNm, fwhmNm: curve.nominalFwhmNm, preShiftNm: curve.declaredPreShiftNm },
    serial: curve.serial,
    sizeMm: curve.sizeMm,
    notes: curve.notes,
    method: curve.method,
    instrument: curve.instrument,
    aoiDeg: curve.aoiDeg,
    lab: curve.lab,
    measuredOn: curve.measuredOn,
    derived: {
      peakT: curve.peakT,
      cwlNm: curve.cwlNm,
      fwhmNm: curve.fwhmNm,
      meanInBandT: curve.meanInBandT,
      effectiveBandwidthNm: curve.effectiveBandwidthNm,
      blockingOd: curve.blockingOd,
      nEff: curve.nEff,
      nEffPolarised: curve.nEffS != null && curve.nEffP != null ? { s: curve.nEffS, p: curve.nEffP } : null,
      tempCoeffNmPerC: curve.tempCoeffNmPerC ?? null,
      pointCount: curve.pointCount,
      lineTransmission: Object.entries(lt)
        .map(([lid, t]) => ({ ...lineInfo(lid), transmission: t }))
        .filter((l) => Number.isFinite(l.wavelengthNm))
        .sort((a, b) => a.wavelengthNm - b.wavelengthNm),
    },
    contributor: { id: curve.contributorId, name },
    submissionId: curve.submissionId,
    verifiedAt: iso(curve.verifiedAt),
    createdAt: iso(curve.createdAt)!,
    citation: citationOf(curve, name, origin),
    links: {
      self: `/api/curves/${curve.id}`,
      page: `/curves/${curve.id}`,
      points: `/api/curves/${curve.id}/points`,
      csv: `/api/curves/${curve.id}/csv`,
      json: `/api/curves/${curve.id}/json`,
      study: `/study?curve=${curve.id}`,
      bibtex: `/api/curves/${curve.id}/cite?format=bibtex`,
      csl: `/api/curves/${curve.id}/cite?format=csl`,
      jcamp: `/api/curves/${curve.id}/jcamp`,
      votable: `/api/curves/${curve.id}/votable`,
    },
  };
}

/** Metadata written into a downloaded file's `#` header. */
export function csvMetadata(d: CurveFileDetail): Record<string, string | number | string[] | null> {
  return {
    curve_id: d.id,
    label: d.label,
    maker: d.maker,
    lines: d.lines.map((l) => l.id),
    serial: d.serial,
    status: d.status,
    revision: d.revision,
    licence: d.licence,
    contributor: d.contributor.name,
    lab: d.lab,
    measured_on: d.measuredOn,
    instrument: d.instrument,
    resolution_nm: typeof d.method.resolutionNm === 'number' ? d.method.resolutionNm : null,
    beam: typeof d.method.beam === 'string' ? d.method.beam : null,
    aoi_deg: d.aoiDeg,
    nominal_cwl_nm: d.nominal.cwlNm,
    nominal_fwhm_nm: d.nominal.fwhmNm,
    cwl_nm: d.derived.cwlNm,
    fwhm_nm: d.derived.fwhmNm,
    peak_t: d.derived.peakT,
    units: 'wavelength nm (standard air), transmission fraction 0-1',
    citation: d.citation,
  };
}

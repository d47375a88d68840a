import 'server-only';
import { notFound } from 'next/navigation';
import { db } from '@/db/models';
import type { Actor } from '@/lib/auth/actor';
import { HttpError } from '@/lib/http/errors';
import { getSubmission } from './views';
import { parseId } from '@/lib/http/ids';
import type { CheckItem } from '@/components/review/check-list';
import type { CurveRow, FileRow, StoredMetadata } from '@/components/review/submission-facts';
import type { ThreadItem } from '@/components/review/thread';

export type SubmissionView = {
  id: number; status: string; revision: number; label: string; lines: string[]; metadata: StoredMetadata; checks: CheckItem[]; checkLevel: string;
  createdAt: string; decidedAt: string | null; contributor: { id: string; name: string | null };
  files: FileRow[]; curves: CurveRow[]; thread: ThreadItem[]; contributorHistory: { id: number; label: string; status: string; createdAt: string }[];
  points: { id: number; aoiDeg: number; wavelengthNm: number[]; transmission: number[] }[];
};

const iso = (d: Date | string | null | undefined) => (d == null ? null : new Date(d).toISOString());

/**
 * The submission pages' view (the contributor's and the moderator's): the same view
 * the API gives (./views), plus the points of the current revision for the chart;
 * a missing or foreign submission becomes the 404 page.
 */
export async function getSubmissionView(actor: Actor, rawId: string): Promise<SubmissionView> {
  let s: Awaited<ReturnType<typeof getSubmission>>;
  try {
    s = await getSubmission(actor, parseId(rawId));
  } catch (err) {
    if (err instanceof HttpError && (err.status === 404 || err.status === 403)) notFound();
    throw err;
  }
  const current = s.curves.filter((c) => c.revision === s.revision);
  const rows = await db().Curve.findAll({ where: { id: current.map((c) => c.id) }, attributes: ['id', 'aoiDeg', 'wavelengthNm', 'transmission'], order: [['aoiDeg', 'ASC']] });
  return {
    ...s,
    metadata: s.metadata as StoredMetadata,
    checks: s.checks as CheckItem[],
    createdAt: iso(s.createdAt)!,
    decidedAt: iso(s.decidedAt),
    files: s.files.map((f) => ({ ...f, createdAt: iso(f.createdAt)! })),
    curves: current,
    thread: s.thread.map((t) => ({ ...t, createdAt: iso(t.createdAt)! })),
    contributorHistory: s.contributorHistory.map((h) => ({ ...h, createdAt: iso(h.createdAt)! })),
    points: rows.map((r) => ({ id: r.id, aoiDeg: r.aoiDeg, wavelengthNm: r.wavelengthNm, transmission: r.transmission })),
  };
}

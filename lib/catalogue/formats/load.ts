import type { Actor } from '@/lib/auth/actor';
import { getCurveFileWithPoints } from '../detail';
import { curveRecord, type CurveRecord } from './record';

/** One curve revision for the citable downloads, only if the actor may read it (otherwise 404, as the curve page). */
export async function loadCurveRecord(actor: Actor | null, id: number, origin: string): Promise<CurveRecord> {
  const { detail, points } = await getCurveFileWithPoints(actor, id, origin);
  return curveRecord(detail, points, origin);
}

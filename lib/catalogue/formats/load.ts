import type { Actor } from '@/lib/auth/actor';
import { getCurveDetail } from '../detail';
import { loadReadableCurve } from '../points';
import { curveRecord, type CurveRecord } from './record';

/** One curve revision for the citable downloads, only if the actor may read it (otherwise 404, as the curve page). */
export async function loadCurveRecord(actor: Actor | null, id: number, origin: string): Promise<CurveRecord> {
  const [detail, curve] = await Promise.all([getCurveDetail(actor, id, origin), loadReadableCurve(actor, id)]);
  return curveRecord(detail, { wavelengthNm: curve.wavelengthNm, transmission: curve.transmission }, origin);
}

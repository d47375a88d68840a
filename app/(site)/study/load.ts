import { Op } from 'sequelize';
import { db } from '@/db/models';
import type { Actor } from '@/lib/auth/actor';
import { loadReadableCurve, readableWhere } from '@/lib/catalogue/points';
import type { StudyCurve } from '@/lib/study/types';
import { wavelengthUncertaintyOf } from '@/lib/engine/quality';

/**
 * The study's catalogue curves with their points, read on the server so the page
 * arrives with numbers already computed. A curve the reader may not see is
 * reported as missing, exactly like a curve that does not exist.
 */
export async function loadStudyCurves(actor: Actor | null, ids: number[]): Promise<{ curves: StudyCurve[]; missing: number[] }> {
  const curves: StudyCurve[] = [];
  const missing: number[] = [];
  for (const id of ids) {
    let c;
    try {
      c = await loadReadableCurve(actor, id);
    } catch {
      missing.push(id);
      continue;
    }
    let set: StudyCurve['set'] = null;
    if (c.setKey) {
      const { Curve } = db();
      const members = await Curve.findAll({
        where: { [Op.and]: [{ setKey: c.setKey }, { cwlNm: { [Op.ne]: null } }, readableWhere(actor)] },
        attributes: ['id', 'aoiDeg', 'cwlNm'],
        order: [['aoiDeg', 'ASC'], ['id', 'ASC']],
      });
      if (members.length >= 2) set = members.map((m) => ({ curveId: m.id, aoiDeg: m.aoiDeg, cwlNm: m.cwlNm as number }));
    }
    const t = (c.method as { temperatureC?: unknown })?.temperatureC;
    curves.push({
      key: `c${c.id}`,
      id: c.id,
      label: c.label,
      source: 'catalogue',
      status: c.status,
      lines: c.lines,
      aoiDeg: c.aoiDeg,
      nEff: c.nEff,
      nEffPolarised: c.nEffS != null && c.nEffP != null ? { s: c.nEffS, p: c.nEffP } : null,
      tempC: typeof t === 'number' && Number.isFinite(t) ? t : null,
      coating: ((c.method as { coating?: unknown })?.coating as StudyCurve['coating']) ?? null,
      tempCoeffNmPerC: c.tempCoeffNmPerC ?? null,
      wavelengthUncertainty: wavelengthUncertaintyOf(c.method),
      cwlNm: c.cwlNm,
      fwhmNm: c.fwhmNm,
      peakT: c.peakT,
      points: { wavelengthNm: c.wavelengthNm, transmission: c.transmission },
      set,
    });
  }
  return { curves, missing };
}

import 'server-only';
import { Op } from 'sequelize';
import { db } from '@/db/models';
import type { Actor } from '@/lib/auth/actor';
import { readableWhere } from '@/lib/catalogue/points';
import { listOptics } from '@/lib/optics/store';
import { wavelengthUncertaintyOf } from '@/lib/engine/quality';
import type { StudyCurve } from './types';

/** The optics a study can pick from: the public examples and the reader's own. */
export type StudyOpticChoice = { id: number; name: string; description: string | null; fNumber: number; obstruction: number; fieldAngleDeg: number; isExample: boolean; mine: boolean };

export type StudyView = { optics: StudyOpticChoice[]; curves: StudyCurve[]; missing: number[] };

/**
 * What the study page needs, read on the server so the page arrives with numbers
 * already computed: the optics, and the chosen catalogue curves with their points
 * and the units of their sets. Two queries whatever the number of curves. A curve
 * the reader may not see is reported as missing, exactly like one that does not exist.
 */
export async function getStudyView(actor: Actor | null, ids: number[]): Promise<StudyView> {
  const [opticViews, loaded] = await Promise.all([listOptics(actor), getStudyCurves(actor, ids)]);
  const optics = opticViews.map((o) => ({
    id: o.id,
    name: o.name,
    description: o.description,
    fNumber: o.fNumber,
    obstruction: o.obstruction,
    fieldAngleDeg: o.fieldAngleDeg,
    isExample: o.isExample,
    mine: o.mine,
  }));
  return { optics, ...loaded };
}

export async function getStudyCurves(actor: Actor | null, ids: number[]): Promise<{ curves: StudyCurve[]; missing: number[] }> {
  if (ids.length === 0) return { curves: [], missing: [] };
  const { Curve } = db();
  const rows = await Curve.scope('withPoints').findAll({ where: { id: [...new Set(ids)], ...readableWhere(actor) } });
  const byId = new Map(rows.map((r) => [r.id, r]));
  const setKeys = [...new Set(rows.map((r) => r.setKey).filter((k): k is string => !!k))];
  const members = setKeys.length
    ? await Curve.findAll({
        where: { [Op.and]: [{ setKey: setKeys }, { cwlNm: { [Op.ne]: null } }, readableWhere(actor)] },
        attributes: ['id', 'setKey', 'aoiDeg', 'cwlNm'],
        order: [['aoiDeg', 'ASC'], ['id', 'ASC']],
      })
    : [];
  const sets = new Map<string, { curveId: number; aoiDeg: number; cwlNm: number }[]>();
  for (const m of members) {
    const list = sets.get(m.setKey as string) ?? [];
    list.push({ curveId: m.id, aoiDeg: m.aoiDeg, cwlNm: m.cwlNm as number });
    sets.set(m.setKey as string, list);
  }

  const curves: StudyCurve[] = [];
  const missing: number[] = [];
  for (const id of ids) {
    const c = byId.get(id);
    if (!c) {
      missing.push(id);
      continue;
    }
    const set = c.setKey ? sets.get(c.setKey) : undefined;
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
      set: set && set.length >= 2 ? set : null,
    });
  }
  return { curves, missing };
}

import { Op } from 'sequelize';
import { db } from '@/db/models';
import type { Actor } from '@/lib/auth/actor';

export interface OpticChoice {
  id: number;
  name: string;
  fNumber: number;
  obstruction: number;
  fieldAngleDeg: number;
  mine: boolean;
}

/** Optics a reader can pick for the fitness filter or an overlay: the public examples and their own. */
export async function opticChoices(actor: Actor | null): Promise<OpticChoice[]> {
  const { Optic } = db();
  const rows = await Optic.findAll({
    where: actor ? { [Op.or]: [{ isExample: true }, { ownerId: actor.id }] } : { isExample: true },
    attributes: ['id', 'name', 'fNumber', 'obstruction', 'fieldAngleDeg', 'ownerId', 'isExample'],
    order: [['isExample', 'ASC'], ['fNumber', 'ASC'], ['id', 'ASC']],
    limit: 200,
  });
  return rows.map((o) => ({
    id: o.id,
    name: o.name,
    fNumber: o.fNumber,
    obstruction: o.obstruction,
    fieldAngleDeg: o.fieldAngleDeg,
    mine: !!actor && o.ownerId === actor.id,
  }));
}

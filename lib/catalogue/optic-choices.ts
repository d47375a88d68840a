import { db } from '@/db/models';
import type { Actor } from '@/lib/auth/actor';
import { visibleOpticsWhere } from '@/lib/auth/policy';
import type { OpticChoice as StudyOpticChoice } from '@/lib/study/url-state';
import { readCatalogue } from './read-source';

/** An optic a reader can pick (the study's own shape), and whether it is theirs. */
export interface OpticChoice extends StudyOpticChoice {
  mine: boolean;
}

/** Optics a reader can pick for the fitness filter or an overlay: the public examples and their own (on the read replica when one serves: a reader who just saved an optic reads the primary). */
export function opticChoices(actor: Actor | null): Promise<OpticChoice[]> {
  return readCatalogue(() => choices(actor));
}

async function choices(actor: Actor | null): Promise<OpticChoice[]> {
  const { Optic } = db();
  const rows = await Optic.findAll({
    where: visibleOpticsWhere(actor),
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

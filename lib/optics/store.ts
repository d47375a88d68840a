import { db } from '@/db/models';
import type { Optic } from '@/db/models/optic';
import type { Actor } from '@/lib/auth/actor';
import { visibleOpticsWhere } from '@/lib/auth/policy';
import { forbidden, notFound, unprocessable } from '@/lib/http/errors';
import { OPTIC_FIELDS, opticInputSchema, opticPatchSchema, type OpticInput, type OpticRaw } from '@/lib/schemas/optics';

/** Enough for any observatory's kit; stops a runaway script filling the table. */
export const MAX_OPTICS_PER_USER = 200;

export type OpticView = {
  id: number;
  name: string;
  description: string | null;
  isExample: boolean;
  mine: boolean;
  apertureMm: number | null;
  focalLengthMm: number | null;
  obstructionMm: number | null;
  reducerFactor: number | null;
  fNumber: number;
  obstruction: number;
  fieldAngleDeg: number;
  sensorDiagonalMm: number | null;
  exitPupilDistanceMm: number | null;
  derived: { fNumber: boolean; obstruction: boolean; fieldAngleDeg: boolean };
  createdAt: string;
  updatedAt: string;
};

export function opticView(o: Optic, actor: Actor | null): OpticView {
  const derived = {
    fNumber: o.apertureMm != null && o.focalLengthMm != null,
    obstruction: o.apertureMm != null && o.obstructionMm != null,
    fieldAngleDeg: o.sensorDiagonalMm != null && o.exitPupilDistanceMm != null,
  };
  return {
    id: o.id,
    name: o.name,
    description: o.description,
    isExample: o.isExample,
    mine: !!actor && o.ownerId === actor.id,
    apertureMm: o.apertureMm,
    focalLengthMm: o.focalLengthMm,
    obstructionMm: o.obstructionMm,
    reducerFactor: o.reducerFactor,
    fNumber: o.fNumber,
    obstruction: o.obstruction,
    fieldAngleDeg: o.fieldAngleDeg,
    sensorDiagonalMm: o.sensorDiagonalMm,
    exitPupilDistanceMm: o.exitPupilDistanceMm,
    derived,
    createdAt: new Date(o.createdAt).toISOString(),
    updatedAt: new Date(o.updatedAt).toISOString(),
  };
}

export async function listOptics(actor: Actor | null): Promise<OpticView[]> {
  const { Optic } = db();
  const rows = await Optic.findAll({ where: visibleOpticsWhere(actor), order: [['isExample', 'ASC'], ['fNumber', 'ASC'], ['id', 'ASC']] });
  return rows.map((o) => opticView(o, actor));
}

export async function findVisibleOptic(actor: Actor | null, id: number): Promise<OpticView> {
  const { Optic } = db();
  const o = await Optic.findOne({ where: { id, ...visibleOpticsWhere(actor) } });
  if (!o) throw notFound(`No optic ${id} that you can read.`);
  return opticView(o, actor);
}

function columns(input: OpticInput) {
  const { derived: _derived, ...rest } = input;
  return rest;
}

export async function createOptic(actor: Actor, input: OpticInput): Promise<OpticView> {
  const { Optic, sequelize } = db();
  return sequelize.transaction(async (transaction) => {
    const owned = await Optic.count({ where: { ownerId: actor.id }, transaction });
    if (owned >= MAX_OPTICS_PER_USER) {
      throw unprocessable(`You already have ${owned} optics; delete some before saving more.`, [{ message: `at most ${MAX_OPTICS_PER_USER} optics per person` }]);
    }
    const o = await Optic.create({ ...columns(input), ownerId: actor.id, isExample: false }, { transaction });
    return opticView(o, actor);
  });
}

/** The optic as typed: derived numbers are left out so a change to the hardware recomputes them. */
function rawOf(o: Optic): OpticRaw {
  const derivedF = o.apertureMm != null && o.focalLengthMm != null;
  const derivedObs = o.apertureMm != null && o.obstructionMm != null;
  const derivedField = o.sensorDiagonalMm != null && o.exitPupilDistanceMm != null;
  const raw: Record<string, unknown> = {
    name: o.name,
    description: o.description,
    apertureMm: o.apertureMm,
    focalLengthMm: o.focalLengthMm,
    obstructionMm: o.obstructionMm,
    reducerFactor: o.reducerFactor,
    sensorDiagonalMm: o.sensorDiagonalMm,
    exitPupilDistanceMm: o.exitPupilDistanceMm,
    fNumber: derivedF ? undefined : o.fNumber,
    obstruction: derivedObs ? undefined : o.obstruction,
    fieldAngleDeg: derivedField ? undefined : o.fieldAngleDeg,
  };
  for (const k of Object.keys(raw)) if (raw[k] == null) delete raw[k];
  return raw as OpticRaw;
}

/** Examples are read-only for everyone; a private optic changes only for its owner. */
async function ownedForChange(actor: Actor, id: number, transaction: import('sequelize').Transaction) {
  const { Optic } = db();
  const o = await Optic.findByPk(id, { transaction, lock: transaction.LOCK.UPDATE });
  // Someone else's private optic answers exactly like a missing one; examples are visible, so they say why.
  if (!o || (!o.isExample && o.ownerId !== actor.id)) throw notFound(`No optic ${id} that you can read.`);
  if (o.isExample) throw forbidden('Example optics are read-only; save a copy of your own to change it.');
  return o;
}

export async function updateOptic(actor: Actor, id: number, body: unknown): Promise<OpticView> {
  const { sequelize } = db();
  return sequelize.transaction(async (transaction) => {
    // Ownership first: someone else's optic is refused whatever the body says.
    const o = await ownedForChange(actor, id, transaction);
    const patch = opticPatchSchema.parse(body);
    const merged: Record<string, unknown> = { ...rawOf(o) };
    for (const k of OPTIC_FIELDS) {
      if (!(k in patch)) continue;
      if (patch[k] === null) delete merged[k];
      else merged[k] = patch[k];
    }
    const input = opticInputSchema.parse(merged);
    await o.update(columns(input), { transaction });
    return opticView(o, actor);
  });
}

export type DeletedOptic = { deleted: true; id: number };

export async function deleteOptic(actor: Actor, id: number): Promise<void> {
  const { sequelize } = db();
  await sequelize.transaction(async (transaction) => {
    const o = await ownedForChange(actor, id, transaction);
    await o.destroy({ transaction });
  });
}

import type { z } from 'zod';
import { Farm, Field, Grower } from '../../db/associations';
import { archivedWhere, assertFound, assertVersion, inScope, iso, scopedWhere } from '../../lib/scope';
import { assertValidBoundary, stripCrs } from '../../lib/geometry';
import { NotFoundError } from '../../errors';
import { toMultiPolygon } from '../../../shared/geo/to-multipolygon';
import type { Actor } from '../../types';
import type {
  Field as FieldDto,
  fieldInputSchema,
  fieldListQuerySchema,
  fieldUpdateSchema,
} from '../../../shared/schemas/field.schema';

const include = [
  { model: Farm, as: 'farm', attributes: ['name'] },
  { model: Grower, as: 'grower', attributes: ['name'] },
];

function toDto(f: Field): FieldDto {
  return {
    id: f.id,
    farmId: f.farmId,
    farmName: f.farm?.name ?? '',
    growerId: f.growerId,
    growerName: f.grower?.name ?? '',
    name: f.name,
    notes: f.notes,
    boundary: stripCrs(f.boundary),
    areaM2: f.areaM2 == null ? null : Number(f.areaM2),
    archivedAt: iso(f.archivedAt),
    version: f.version,
    updatedAt: f.updatedAt.toISOString(),
  };
}

export async function listFields(actor: Actor, q: z.output<typeof fieldListQuerySchema>) {
  const rows = await Field.findAll({
    where: scopedWhere(actor, {
      ...archivedWhere(q.archived),
      ...(q.growerId ? { growerId: q.growerId } : {}),
      ...(q.farmId ? { farmId: q.farmId } : {}),
    }),
    include,
    order: [['name', 'ASC']],
  });
  return { items: rows.map(toDto) };
}

async function findScoped(actor: Actor, id: string) {
  return assertFound(await Field.findOne({ where: scopedWhere(actor, { id }), include }), 'Field');
}

export const getField = async (actor: Actor, id: string) => toDto(await findScoped(actor, id));

async function boundaryOf(input: { boundary?: z.output<typeof fieldInputSchema>['boundary'] }) {
  if (!input.boundary) return null;
  const geom = toMultiPolygon(input.boundary);
  await assertValidBoundary(Field.sequelize!, geom);
  return geom;
}

export async function createField(actor: Actor, input: z.output<typeof fieldInputSchema>) {
  const farm = await Farm.findByPk(input.farmId);
  if (!farm || !inScope(actor, farm.workspaceId, farm.growerId)) throw new NotFoundError('Farm');
  const boundary = await boundaryOf(input);
  const field = await Field.create({
    workspaceId: actor.workspaceId,
    growerId: farm.growerId,
    farmId: farm.id,
    name: input.name,
    notes: input.notes,
    boundary,
  });
  return getField(actor, field.id);
}

export async function updateField(actor: Actor, id: string, input: z.output<typeof fieldUpdateSchema>) {
  const field = await findScoped(actor, id);
  assertVersion(field.version, input.version);
  field.set({ name: input.name, notes: input.notes });
  // A boundary left out keeps the one stored; null removes it.
  if (input.boundary !== undefined) field.boundary = await boundaryOf(input);
  await field.save();
  return getField(actor, id);
}

export async function setFieldArchived(actor: Actor, id: string, archived: boolean) {
  const field = await findScoped(actor, id);
  field.archivedAt = archived ? new Date() : null;
  await field.save();
  return getField(actor, id);
}

import type { z } from 'zod';
import { CropSeason, Farm, Field, Grower } from '../../db/associations';
import { archivedWhere, assertFound, assertVersion, inScope, iso, scopedWhere } from '../../lib/scope';
import { NotFoundError } from '../../errors';
import type { Actor } from '../../types';
import type {
  Season as SeasonDto,
  seasonInputSchema,
  seasonListQuerySchema,
  seasonUpdateSchema,
} from '../../../shared/schemas/season.schema';

const include = [
  {
    model: Field,
    as: 'field',
    attributes: ['name'],
    include: [{ model: Farm, as: 'farm', attributes: ['name'] }],
  },
  { model: Grower, as: 'grower', attributes: ['name'] },
];

function toDto(s: CropSeason & { grower?: Grower }): SeasonDto {
  return {
    id: s.id,
    fieldId: s.fieldId,
    fieldName: s.field?.name ?? '',
    farmName: s.field?.farm?.name ?? '',
    growerId: s.growerId,
    growerName: s.grower?.name ?? '',
    year: s.year,
    crop: s.crop,
    plannedPlantingDate: s.plannedPlantingDate,
    notes: s.notes,
    archivedAt: iso(s.archivedAt),
    version: s.version,
    updatedAt: s.updatedAt.toISOString(),
  };
}

export async function listSeasons(actor: Actor, q: z.output<typeof seasonListQuerySchema>) {
  const rows = await CropSeason.findAll({
    where: scopedWhere(actor, {
      ...archivedWhere(q.archived),
      ...(q.growerId ? { growerId: q.growerId } : {}),
      ...(q.fieldId ? { fieldId: q.fieldId } : {}),
      ...(q.year ? { year: q.year } : {}),
    }),
    include,
    order: [
      ['year', 'DESC'],
      ['crop', 'ASC'],
    ],
  });
  return { items: rows.map(toDto) };
}

async function findScoped(actor: Actor, id: string) {
  return assertFound(await CropSeason.findOne({ where: scopedWhere(actor, { id }), include }), 'Crop season');
}

export const getSeason = async (actor: Actor, id: string) => toDto(await findScoped(actor, id));

export async function createSeason(actor: Actor, input: z.output<typeof seasonInputSchema>) {
  const field = await Field.findByPk(input.fieldId);
  if (!field || !inScope(actor, field.workspaceId, field.growerId)) throw new NotFoundError('Field');
  const season = await CropSeason.create({
    workspaceId: actor.workspaceId,
    growerId: field.growerId,
    fieldId: field.id,
    year: input.year,
    crop: input.crop,
    plannedPlantingDate: input.plannedPlantingDate,
    notes: input.notes,
  });
  return getSeason(actor, season.id);
}

export async function updateSeason(actor: Actor, id: string, input: z.output<typeof seasonUpdateSchema>) {
  const season = await findScoped(actor, id);
  assertVersion(season.version, input.version);
  season.set({
    year: input.year,
    crop: input.crop,
    plannedPlantingDate: input.plannedPlantingDate,
    notes: input.notes,
  });
  await season.save();
  return getSeason(actor, id);
}

export async function setSeasonArchived(actor: Actor, id: string, archived: boolean) {
  const season = await findScoped(actor, id);
  season.archivedAt = archived ? new Date() : null;
  await season.save();
  return getSeason(actor, id);
}

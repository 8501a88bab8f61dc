import { literal } from 'sequelize';
import type { z } from 'zod';
import { Farm, Grower } from '../../db/associations';
import { archivedWhere, assertFound, assertVersion, inScope, iso, scopedWhere } from '../../lib/scope';
import { NotFoundError } from '../../errors';
import type { Actor } from '../../types';
import type {
  Farm as FarmDto,
  farmInputSchema,
  farmListQuerySchema,
  farmUpdateSchema,
} from '../../../shared/schemas/farm.schema';

const extra = [
  [
    literal(`(SELECT count(*) FROM fields f WHERE f.farm_id = "Farm"."id" AND f.archived_at IS NULL)`),
    'fieldCount',
  ],
  [
    literal(
      `(SELECT coalesce(sum(f.area_m2), 0) FROM fields f WHERE f.farm_id = "Farm"."id" AND f.archived_at IS NULL)`,
    ),
    'areaM2',
  ],
] as [ReturnType<typeof literal>, string][];

const include = [{ model: Grower, as: 'grower', attributes: ['name'] }];

function toDto(f: Farm): FarmDto {
  return {
    id: f.id,
    growerId: f.growerId,
    growerName: f.grower?.name ?? '',
    name: f.name,
    notes: f.notes,
    archivedAt: iso(f.archivedAt),
    version: f.version,
    fieldCount: Number(f.get('fieldCount') ?? 0),
    areaM2: Number(f.get('areaM2') ?? 0),
    updatedAt: f.updatedAt.toISOString(),
  };
}

export async function listFarms(actor: Actor, q: z.output<typeof farmListQuerySchema>) {
  const rows = await Farm.findAll({
    where: scopedWhere(actor, {
      ...archivedWhere(q.archived),
      ...(q.growerId ? { growerId: q.growerId } : {}),
    }),
    attributes: { include: extra },
    include,
    order: [['name', 'ASC']],
  });
  return { items: rows.map(toDto) };
}

async function findScoped(actor: Actor, id: string) {
  const row = await Farm.findOne({
    where: scopedWhere(actor, { id }),
    attributes: { include: extra },
    include,
  });
  return assertFound(row, 'Farm');
}

export const getFarm = async (actor: Actor, id: string) => toDto(await findScoped(actor, id));

export async function createFarm(actor: Actor, input: z.output<typeof farmInputSchema>) {
  const grower = await Grower.findByPk(input.growerId);
  if (!grower || !inScope(actor, grower.workspaceId, grower.id)) throw new NotFoundError('Grower');
  const farm = await Farm.create({
    workspaceId: actor.workspaceId,
    growerId: grower.id,
    name: input.name,
    notes: input.notes,
  });
  return getFarm(actor, farm.id);
}

export async function updateFarm(actor: Actor, id: string, input: z.output<typeof farmUpdateSchema>) {
  const farm = await findScoped(actor, id);
  assertVersion(farm.version, input.version);
  farm.set({ name: input.name, notes: input.notes });
  await farm.save();
  return getFarm(actor, id);
}

export async function setFarmArchived(actor: Actor, id: string, archived: boolean) {
  const farm = await findScoped(actor, id);
  farm.archivedAt = archived ? new Date() : null;
  await farm.save();
  return getFarm(actor, id);
}

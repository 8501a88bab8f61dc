import { literal, type WhereOptions } from 'sequelize';
import { Grower } from '../../db/associations';
import { archivedWhere, assertFound, assertVersion, inScope, iso, scopedWhere } from '../../lib/scope';
import type { Actor } from '../../types';
import type { Grower as GrowerDto } from '../../../shared/schemas/grower.schema';
import type { growerInputSchema, growerUpdateSchema } from '../../../shared/schemas/grower.schema';
import type { z } from 'zod';

const counts = [
  [
    literal(`(SELECT count(*) FROM farms f WHERE f.grower_id = "Grower"."id" AND f.archived_at IS NULL)`),
    'farmCount',
  ],
  [
    literal(`(SELECT count(*) FROM fields f WHERE f.grower_id = "Grower"."id" AND f.archived_at IS NULL)`),
    'fieldCount',
  ],
  [
    literal(`(SELECT count(*) FROM planters p WHERE p.grower_id = "Grower"."id" AND p.archived_at IS NULL)`),
    'planterCount',
  ],
] as const;

function toDto(g: Grower): GrowerDto {
  return {
    id: g.id,
    name: g.name,
    contactName: g.contactName,
    email: g.email,
    phone: g.phone,
    notes: g.notes,
    archivedAt: iso(g.archivedAt),
    version: g.version,
    farmCount: Number(g.get('farmCount') ?? 0),
    fieldCount: Number(g.get('fieldCount') ?? 0),
    planterCount: Number(g.get('planterCount') ?? 0),
    updatedAt: g.updatedAt.toISOString(),
  };
}

/** A grower's own id is its grower column: the scope applies to `id`. */
const whereFor = (actor: Actor, conditions: WhereOptions) => scopedWhere(actor, conditions, 'id');

export async function listGrowers(actor: Actor, archived: 'true' | 'false' | 'only') {
  const rows = await Grower.findAll({
    where: whereFor(actor, archivedWhere(archived)),
    attributes: { include: counts.map(([l, n]) => [l, n]) },
    order: [['name', 'ASC']],
  });
  return { items: rows.map(toDto) };
}

async function findScoped(actor: Actor, id: string) {
  const row = await Grower.findOne({
    where: whereFor(actor, { id }),
    attributes: { include: counts.map(([l, n]) => [l, n]) },
  });
  return assertFound(row, 'Grower');
}

export const getGrower = async (actor: Actor, id: string) => toDto(await findScoped(actor, id));

export async function createGrower(actor: Actor, input: z.output<typeof growerInputSchema>) {
  const g = await Grower.create({
    workspaceId: actor.workspaceId,
    name: input.name,
    contactName: input.contactName,
    email: input.email,
    phone: input.phone,
    notes: input.notes,
  });
  return getGrower(actor, g.id);
}

export async function updateGrower(actor: Actor, id: string, input: z.output<typeof growerUpdateSchema>) {
  const g = await findScoped(actor, id);
  assertVersion(g.version, input.version);
  g.set({
    name: input.name,
    contactName: input.contactName,
    email: input.email,
    phone: input.phone,
    notes: input.notes,
  });
  await g.save();
  return getGrower(actor, id);
}

export async function setGrowerArchived(actor: Actor, id: string, archived: boolean) {
  const g = await findScoped(actor, id);
  g.archivedAt = archived ? new Date() : null;
  await g.save();
  return getGrower(actor, id);
}

export { inScope };

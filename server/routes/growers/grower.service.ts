import { literal, type WhereOptions } from 'sequelize';
import { Grower } from '../../db/associations';
import { preparedRows } from '../../db/prepared';
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

type GrowerRow = {
  id: string;
  name: string;
  contact_name: string | null;
  email: string | null;
  phone: string | null;
  notes: string | null;
  archived_at: Date | null;
  version: number;
  updated_at: Date;
  farm_count: number;
  field_count: number;
  planter_count: number;
};

/** The read behind `GET /api/growers/:id`, a prepared statement (server/db/prepared.ts); $3 is the grower scope. */
const READ_GROWER = `
  SELECT g.id, g.name, g.contact_name, g.email, g.phone, g.notes, g.archived_at, g.version, g.updated_at,
         (SELECT count(*) FROM farms f WHERE f.grower_id = g.id AND f.archived_at IS NULL) AS farm_count,
         (SELECT count(*) FROM fields f WHERE f.grower_id = g.id AND f.archived_at IS NULL) AS field_count,
         (SELECT count(*) FROM planters p WHERE p.grower_id = g.id AND p.archived_at IS NULL) AS planter_count
    FROM growers g
   WHERE g.workspace_id = $1 AND g.id = $2 AND ($3::uuid[] IS NULL OR g.id = ANY ($3::uuid[]))`;

export async function getGrower(actor: Actor, id: string): Promise<GrowerDto> {
  const [g] = await preparedRows<GrowerRow>(Grower.sequelize!, 'read_grower', READ_GROWER, [
    actor.workspaceId,
    id,
    actor.growerScope,
  ]);
  assertFound(g, 'Grower');
  return {
    id: g.id,
    name: g.name,
    contactName: g.contact_name,
    email: g.email,
    phone: g.phone,
    notes: g.notes,
    archivedAt: iso(g.archived_at),
    version: g.version,
    farmCount: g.farm_count,
    fieldCount: g.field_count,
    planterCount: g.planter_count,
    updatedAt: g.updated_at.toISOString(),
  };
}

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

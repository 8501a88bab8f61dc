import type { z } from 'zod';
import { Grower, Planter } from '../../db/associations';
import { archivedWhere, assertFound, assertVersion, inScope, iso, scopedWhere } from '../../lib/scope';
import { NotFoundError } from '../../errors';
import { countSections } from '../../../shared/rates/count-sections';
import type { Actor } from '../../types';
import type {
  Planter as PlanterDto,
  planterInputSchema,
  planterListQuerySchema,
  planterUpdateSchema,
} from '../../../shared/schemas/planter.schema';

const include = [{ model: Grower, as: 'grower', attributes: ['name'] }];

export function planterToDto(p: Planter): PlanterDto {
  return {
    id: p.id,
    growerId: p.growerId,
    growerName: p.grower?.name ?? '',
    name: p.name,
    rowCount: p.rowCount,
    rowSpacingM: p.rowSpacingM,
    arrangement: p.arrangement,
    interplantRowCount: p.interplantRowCount,
    rowsPerSection: p.rowsPerSection,
    displaySectionLimit: p.displaySectionLimit,
    sectionCount: countSections(p.rowCount, p.rowsPerSection),
    holesPerDisc: p.holesPerDisc,
    discRpmMin: p.discRpmMin,
    discRpmMax: p.discRpmMax,
    speedMinMps: p.speedMinMps,
    speedPlannedMps: p.speedPlannedMps,
    speedMaxMps: p.speedMaxMps,
    groundSpeedSource: p.groundSpeedSource,
    notes: p.notes,
    archivedAt: iso(p.archivedAt),
    version: p.version,
    updatedAt: p.updatedAt.toISOString(),
  };
}

export async function listPlanters(actor: Actor, q: z.output<typeof planterListQuerySchema>) {
  const rows = await Planter.findAll({
    where: scopedWhere(actor, {
      ...archivedWhere(q.archived),
      ...(q.growerId ? { growerId: q.growerId } : {}),
    }),
    include,
    order: [['name', 'ASC']],
  });
  return { items: rows.map(planterToDto) };
}

async function findScoped(actor: Actor, id: string) {
  return assertFound(await Planter.findOne({ where: scopedWhere(actor, { id }), include }), 'Planter');
}

export const getPlanter = async (actor: Actor, id: string) => planterToDto(await findScoped(actor, id));

/** The profile fields a create or an edit may set: an allowlist, never the request body as it came. */
function profileOf(input: z.output<typeof planterUpdateSchema> | z.output<typeof planterInputSchema>) {
  return {
    name: input.name,
    rowCount: input.rowCount,
    rowSpacingM: input.rowSpacingM,
    arrangement: input.arrangement,
    interplantRowCount: input.interplantRowCount,
    rowsPerSection: input.rowsPerSection,
    displaySectionLimit: input.displaySectionLimit,
    holesPerDisc: input.holesPerDisc,
    discRpmMin: input.discRpmMin,
    discRpmMax: input.discRpmMax,
    speedMinMps: input.speedMinMps,
    speedPlannedMps: input.speedPlannedMps,
    speedMaxMps: input.speedMaxMps,
    groundSpeedSource: input.groundSpeedSource,
    notes: input.notes,
  };
}

export async function createPlanter(actor: Actor, input: z.output<typeof planterInputSchema>) {
  const grower = await Grower.findByPk(input.growerId);
  if (!grower || !inScope(actor, grower.workspaceId, grower.id)) throw new NotFoundError('Grower');
  const planter = await Planter.create({
    workspaceId: actor.workspaceId,
    growerId: grower.id,
    ...profileOf(input),
  });
  return getPlanter(actor, planter.id);
}

export async function updatePlanter(actor: Actor, id: string, input: z.output<typeof planterUpdateSchema>) {
  const planter = await findScoped(actor, id);
  assertVersion(planter.version, input.version);
  planter.set(profileOf(input));
  await planter.save();
  return getPlanter(actor, id);
}

export async function setPlanterArchived(actor: Actor, id: string, archived: boolean) {
  const planter = await findScoped(actor, id);
  planter.archivedAt = archived ? new Date() : null;
  await planter.save();
  return getPlanter(actor, id);
}

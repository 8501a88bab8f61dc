import { randomUUID } from 'node:crypto';
import type { Model, ModelStatic } from 'sequelize';
import { CropSeason, Farm, Field, Grower, Planter } from '../../server/db/associations';
import { CROPS } from '../../shared/schemas/crops';
import { planterBody, squareBoundary, type World } from './factory';

/** The five register resources, by their URL segment. */
export const KINDS = ['growers', 'farms', 'fields', 'seasons', 'planters'] as const;
export type Kind = (typeof KINDS)[number];
/** Grower A or grower B of a world. */
export type Side = 'a' | 'b';

export const MODELS: Record<Kind, ModelStatic<Model>> = {
  growers: Grower,
  farms: Farm,
  fields: Field,
  seasons: CropSeason,
  planters: Planter,
} as unknown as Record<Kind, ModelStatic<Model>>;

const ROW_OF = {
  growers: 'grower',
  farms: 'farm',
  fields: 'field',
  seasons: 'season',
  planters: 'planter',
} as const;

/** The id of the world's row of this kind under grower A or B. */
export const idOf = (world: World, kind: Kind, side: Side): string => world[side][ROW_OF[kind]].id;

/** The row as the database holds it now (attributes only). */
export async function rowOf(kind: Kind, id: string): Promise<Record<string, unknown>> {
  const row = await MODELS[kind].findByPk(id);
  if (!row) throw new Error(`no ${kind} row ${id}`);
  return row.get({ plain: true }) as Record<string, unknown>;
}

let serial = 0;
/** A short tag that makes names unique within a workspace. */
export const tag = () => `${++serial}-${randomUUID().slice(0, 6)}`;

/**
 * A valid create body for a resource under grower A or B of the world. Seasons get a year and crop of their
 * own (one active season per field, year and crop).
 */
export function createBody(
  world: World,
  kind: Kind,
  side: Side,
  name = `Item ${tag()}`,
): Record<string, unknown> {
  const g = world[side];
  switch (kind) {
    case 'growers':
      return { name, contactName: 'Test contact', email: null, phone: '555 0100', notes: null };
    case 'farms':
      return { growerId: g.grower.id, name, notes: null };
    case 'fields':
      return { farmId: g.farm.id, name, notes: null, boundary: squareBoundary() };
    case 'seasons': {
      // Years 2030 to 2089: clear of the world's own 2027 season.
      const n = ++serial;
      return {
        fieldId: g.field.id,
        year: 2030 + (n % 60),
        crop: CROPS[Math.floor(n / 60) % CROPS.length],
        notes: null,
      };
    }
    case 'planters':
      return { ...planterBody(g.grower.id), name };
  }
}

/** A valid update body built from the row as stored now (its current version), with new notes. */
export async function updateBody(
  kind: Kind,
  id: string,
  extra: Record<string, unknown> = {},
): Promise<Record<string, unknown>> {
  const {
    id: _id,
    workspaceId: _ws,
    growerId: _grower,
    farmId: _farm,
    fieldId: _field,
    boundary: _boundary,
    areaM2: _area,
    archivedAt: _archived,
    createdAt: _created,
    updatedAt: _updated,
    ...editable
  } = await rowOf(kind, id);
  return { ...editable, notes: `edited ${tag()}`, ...extra };
}

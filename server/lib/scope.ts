import { Op, type WhereOptions } from 'sequelize';
import { ConflictError, NotFoundError } from '../errors';
import type { Actor } from '../types';

/**
 * Rows of the actor's workspace, and for farmers and consultants only their growers' rows, AND the given
 * conditions. The scope is a clause of its own: a condition from the request (an `:id`, `?growerId=`) can
 * only narrow it, never widen it by replacing a key of the same name in a merged object.
 */
export function scopedWhere(
  actor: Actor,
  conditions: WhereOptions = {},
  growerColumn = 'growerId',
): WhereOptions {
  const scope: Record<string, unknown> = { workspaceId: actor.workspaceId };
  if (actor.growerScope) scope[growerColumn] = { [Op.in]: actor.growerScope };
  return { [Op.and]: [scope, conditions] };
}

export function archivedWhere(archived: 'true' | 'false' | 'only'): WhereOptions {
  if (archived === 'true') return {};
  if (archived === 'only') return { archivedAt: { [Op.ne]: null } };
  return { archivedAt: null };
}

/** True when the actor may see rows of this grower. */
export function inScope(actor: Actor, workspaceId: string, growerId: string) {
  return workspaceId === actor.workspaceId && (!actor.growerScope || actor.growerScope.includes(growerId));
}

export function assertFound<T>(row: T | null | undefined, what: string): T {
  if (!row) throw new NotFoundError(what);
  return row;
}

/** Optimistic locking: the client sends the version it read; a different one means someone else saved. */
export function assertVersion(current: number, sent: number) {
  if (current !== sent) {
    throw new ConflictError(
      'Someone else changed this record since you opened it: reload it and try again',
      'stale',
    );
  }
}

export const iso = (d: Date | null | undefined) => (d ? d.toISOString() : null);

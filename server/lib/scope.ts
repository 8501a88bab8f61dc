import { Op, type WhereOptions } from 'sequelize';
import { ConflictError, NotFoundError } from '../errors';
import type { Actor } from '../types';

/** Rows of the actor's workspace, and for farmers and consultants only their growers' rows. */
export function scopedWhere(actor: Actor, growerColumn = 'growerId'): WhereOptions {
  const where: Record<string, unknown> = { workspaceId: actor.workspaceId };
  if (actor.growerScope) where[growerColumn] = { [Op.in]: actor.growerScope };
  return where as WhereOptions;
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
    throw new ConflictError('Someone else changed this record since you opened it: reload it and try again', 'stale');
  }
}

export const iso = (d: Date | null | undefined) => (d ? d.toISOString() : null);

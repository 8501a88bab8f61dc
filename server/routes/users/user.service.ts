import { Op, type Transaction } from 'sequelize';
import type { z } from 'zod';
import { ConsultantGrower, Grower, User } from '../../db/associations';
import { ConflictError, NotFoundError } from '../../errors';
import { assertFound, assertVersion, iso } from '../../lib/scope';
import { forgetSession } from '../../lib/session-cache';
import type { Mailer } from '../../mail/mailer';
import type { Actor } from '../../types';
import type {
  inviteUserSchema,
  updateUserSchema,
  User as UserDto,
} from '../../../shared/schemas/user.schema';
import { sendInvitation } from '../auth/auth.service';

function toDto(u: User, growerIds: string[]): UserDto {
  return {
    id: u.id,
    email: u.email,
    name: u.name,
    role: u.role,
    status: u.status,
    growerId: u.growerId,
    growerIds,
    version: u.version,
    lastSignInAt: iso(u.lastSignInAt),
    createdAt: u.createdAt.toISOString(),
  };
}

async function assignmentsOf(userIds: string[]) {
  const rows = await ConsultantGrower.findAll({ where: { userId: { [Op.in]: userIds } } });
  const map = new Map<string, string[]>();
  for (const r of rows) map.set(r.userId, [...(map.get(r.userId) ?? []), r.growerId]);
  return map;
}

export async function listUsers(actor: Actor) {
  const users = await User.findAll({ where: { workspaceId: actor.workspaceId }, order: [['name', 'ASC']] });
  const map = await assignmentsOf(users.map((u) => u.id));
  return { items: users.map((u) => toDto(u, map.get(u.id) ?? [])) };
}

async function findScoped(actor: Actor, id: string) {
  return assertFound(await User.findOne({ where: { id, workspaceId: actor.workspaceId } }), 'User');
}

export async function getUser(actor: Actor, id: string) {
  const user = await findScoped(actor, id);
  const map = await assignmentsOf([user.id]);
  return toDto(user, map.get(user.id) ?? []);
}

/** Growers named in an assignment must all belong to the workspace; otherwise they are "not found". */
async function checkGrowers(actor: Actor, ids: string[]) {
  if (ids.length === 0) return;
  const found = await Grower.count({ where: { id: { [Op.in]: ids }, workspaceId: actor.workspaceId } });
  if (found !== new Set(ids).size) throw new NotFoundError('Grower');
}

type Assignment = { role: UserDto['role']; growerId?: string | null; growerIds?: string[] };

async function applyAssignments(actor: Actor, user: User, a: Assignment) {
  const growerIds = a.role === 'consultant' ? [...new Set(a.growerIds ?? [])] : [];
  const growerId = a.role === 'farmer' ? (a.growerId ?? null) : null;
  await checkGrowers(actor, [...growerIds, ...(growerId ? [growerId] : [])]);
  user.growerId = growerId;
  return growerIds;
}

async function writeConsultantGrowers(
  actor: Actor,
  userId: string,
  growerIds: string[],
  transaction: Transaction,
) {
  await ConsultantGrower.destroy({ where: { userId }, transaction });
  if (growerIds.length) {
    await ConsultantGrower.bulkCreate(
      growerIds.map((growerId) => ({ userId, growerId, workspaceId: actor.workspaceId })),
      { transaction },
    );
  }
}

export async function inviteUser(
  actor: Actor,
  input: z.output<typeof inviteUserSchema>,
  mailer: Mailer,
  appUrl: string,
  invitedBy: string,
) {
  const user = User.build({
    workspaceId: actor.workspaceId,
    email: input.email,
    name: input.name,
    role: input.role,
    status: 'invited',
    passwordHash: null,
    growerId: null,
    lastSignInAt: null,
  });
  const growerIds = await applyAssignments(actor, user, input);
  // No CLS namespace is set up: the transaction must be passed to each query, or they run outside it.
  await User.sequelize!.transaction(async (transaction) => {
    await user.save({ transaction });
    await writeConsultantGrowers(actor, user.id, growerIds, transaction);
  });
  await sendInvitation(user, mailer, appUrl, invitedBy);
  return getUser(actor, user.id);
}

export async function updateUser(actor: Actor, id: string, input: z.output<typeof updateUserSchema>) {
  const user = await findScoped(actor, id);
  assertVersion(user.version, input.version);
  if (user.id === actor.userId && (input.role !== user.role || input.status === 'disabled')) {
    throw new ConflictError(
      'You cannot change your own role or disable yourself; ask another admin',
      'conflict',
      [{ path: ['role'], message: 'You cannot change your own role' }],
    );
  }
  const statusChanged =
    input.status !== undefined && user.status !== 'invited' && input.status !== user.status;
  const roleChanged = input.role !== user.role;
  const scopeBefore = JSON.stringify([
    user.growerId,
    [...((await assignmentsOf([user.id])).get(user.id) ?? [])].sort(),
  ]);
  user.name = input.name;
  user.role = input.role;
  if (statusChanged && input.status) user.status = input.status;
  const growerIds = await applyAssignments(actor, user, input);
  const scopeChanged = scopeBefore !== JSON.stringify([user.growerId, [...growerIds].sort()]);
  // A role change, a new grower scope or disabling ends the person's sessions at once; a new name does not.
  if (roleChanged || statusChanged || scopeChanged) user.tokenVersion += 1;
  // No CLS namespace is set up: the transaction must be passed to each query, or they run outside it.
  await User.sequelize!.transaction(async (transaction) => {
    await user.save({ transaction });
    await writeConsultantGrowers(actor, user.id, growerIds, transaction);
  });
  forgetSession(user.id);
  return getUser(actor, id);
}

export async function resendInvitation(
  actor: Actor,
  id: string,
  mailer: Mailer,
  appUrl: string,
  invitedBy: string,
) {
  const user = await findScoped(actor, id);
  await sendInvitation(user, mailer, appUrl, invitedBy);
}

import { createHash, randomBytes } from 'node:crypto';
import { Op } from 'sequelize';
import { User, UserToken, Workspace } from '../../db/associations';
import { ConflictError, InvalidCredentialsError, NotFoundError, ValidationError } from '../../errors';
import { dummyHash, hashPassword, verifyPassword } from '../../lib/passwords';
import { forgetSession } from '../../lib/session-cache';
import type { Mailer } from '../../mail/mailer';
import type { TokenPurpose } from '../../db/models/user-token.model';
import type { Me } from '../../../shared/schemas/auth.schema';

export const INVITE_HOURS = 7 * 24;
export const RESET_HOURS = 1;

const hashToken = (token: string) => createHash('sha256').update(token).digest('hex');

/** The `me` shape, built on purpose: never the model. */
export async function meOf(user: User): Promise<Me> {
  const workspace = user.workspace ?? (await Workspace.findByPk(user.workspaceId));
  return {
    id: user.id,
    email: user.email,
    name: user.name,
    role: user.role,
    workspace: { id: user.workspaceId, name: workspace?.name ?? '' },
    growerId: user.growerId,
    unitSystem: user.unitSystem,
  };
}

/** Unknown e-mail, wrong password, and an account that cannot sign in all answer alike (ASVS 6.3.8). */
export async function signIn(email: string, password: string): Promise<User> {
  const user = await User.findOne({ where: { email: email.toLowerCase() } });
  const hash = user?.passwordHash ?? (await dummyHash());
  const ok = await verifyPassword(hash, password);
  if (!user || !ok || !user.passwordHash || user.status !== 'active') throw new InvalidCredentialsError();
  // Static updates leave the admin-facing `version` alone: signing in is not an edit of the person.
  user.lastSignInAt = new Date();
  await User.update({ lastSignInAt: user.lastSignInAt }, { where: { id: user.id } });
  return user;
}

/** Ends every session of the user by moving the token version on. */
export async function endSessions(userId: string) {
  await User.increment('tokenVersion', { by: 1, where: { id: userId } });
  forgetSession(userId);
}

export async function changePassword(userId: string, current: string, next: string): Promise<User> {
  const user = await User.findByPk(userId);
  if (!user || !user.passwordHash) throw new NotFoundError('User');
  if (!(await verifyPassword(user.passwordHash, current))) {
    throw new ValidationError('The current password is not right', [
      { path: ['currentPassword'], message: 'The current password is not right' },
    ]);
  }
  user.passwordHash = await hashPassword(next);
  user.tokenVersion += 1;
  await User.update(
    { passwordHash: user.passwordHash, tokenVersion: user.tokenVersion },
    { where: { id: user.id } },
  );
  forgetSession(user.id);
  return user;
}

async function issueToken(userId: string, purpose: TokenPurpose, hours: number): Promise<string> {
  const token = randomBytes(32).toString('base64url');
  // One live link per purpose: older ones stop working.
  await UserToken.update({ usedAt: new Date() }, { where: { userId, purpose, usedAt: { [Op.is]: null } } });
  await UserToken.create({
    userId,
    purpose,
    tokenHash: hashToken(token),
    expiresAt: new Date(Date.now() + hours * 3600_000),
    usedAt: null,
  });
  return token;
}

async function liveToken(token: string, purpose: TokenPurpose) {
  const row = await UserToken.findOne({ where: { tokenHash: hashToken(token), purpose } });
  if (!row || row.usedAt || row.expiresAt.getTime() < Date.now()) return null;
  return row;
}

/** Always succeeds from the caller's point of view; mails a link only to an active account. */
export async function requestPasswordReset(email: string, mailer: Mailer, appUrl: string) {
  const user = await User.findOne({ where: { email: email.toLowerCase(), status: 'active' } });
  if (!user) return;
  const token = await issueToken(user.id, 'reset', RESET_HOURS);
  const link = `${appUrl}/reset-password?token=${token}`;
  await mailer.send({
    to: user.email,
    subject: 'Reset your Sowright password',
    text: [
      `Hello ${user.name},`,
      '',
      'Someone asked to reset the password of your Sowright account. To choose a new one, open:',
      link,
      '',
      `The link works once, for ${RESET_HOURS} hour. If you did not ask, ignore this message: your password stays as it is.`,
    ].join('\n'),
  });
}

export async function resetPassword(token: string, password: string) {
  const row = await liveToken(token, 'reset');
  if (!row) throw new NotFoundError('Reset link (it may have expired or been used)');
  const user = await User.findByPk(row.userId);
  if (!user || user.status !== 'active')
    throw new NotFoundError('Reset link (it may have expired or been used)');
  await User.update(
    { passwordHash: await hashPassword(password), tokenVersion: user.tokenVersion + 1 },
    { where: { id: user.id } },
  );
  forgetSession(user.id);
  row.usedAt = new Date();
  await row.save();
}

export async function sendInvitation(user: User, mailer: Mailer, appUrl: string, invitedBy: string) {
  if (user.status !== 'invited') throw new ConflictError('This person has already accepted the invitation');
  const token = await issueToken(user.id, 'invite', INVITE_HOURS);
  const workspace = await Workspace.findByPk(user.workspaceId);
  await mailer.send({
    to: user.email,
    subject: `You are invited to ${workspace?.name ?? 'a workspace'} on Sowright`,
    text: [
      `Hello ${user.name},`,
      '',
      `${invitedBy} invited you to join ${workspace?.name ?? 'their workspace'} on Sowright as ${user.role}.`,
      'To accept and choose your password, open:',
      `${appUrl}/invitation?token=${token}`,
      '',
      `The link works once, for ${INVITE_HOURS / 24} days.`,
    ].join('\n'),
  });
}

export async function describeInvitation(token: string) {
  const row = await liveToken(token, 'invite');
  const user = row
    ? await User.findByPk(row.userId, { include: [{ model: Workspace, as: 'workspace' }] })
    : null;
  if (!row || !user || user.status !== 'invited') {
    throw new NotFoundError('Invitation (it may have expired or been used)');
  }
  return { email: user.email, name: user.name, workspaceName: user.workspace?.name ?? '' };
}

export async function acceptInvitation(token: string, password: string, name?: string): Promise<User> {
  const row = await liveToken(token, 'invite');
  const user = row ? await User.findByPk(row.userId) : null;
  if (!row || !user || user.status !== 'invited') {
    throw new NotFoundError('Invitation (it may have expired or been used)');
  }
  user.passwordHash = await hashPassword(password);
  user.status = 'active';
  if (name) user.name = name;
  user.tokenVersion += 1;
  user.lastSignInAt = new Date();
  await user.save();
  forgetSession(user.id);
  row.usedAt = new Date();
  await row.save();
  return user;
}

export async function setPreferences(userId: string, unitSystem: 'imperial' | 'metric') {
  const user = await User.findByPk(userId);
  if (!user) throw new NotFoundError('User');
  user.unitSystem = unitSystem;
  await User.update({ unitSystem }, { where: { id: userId } });
  return user;
}

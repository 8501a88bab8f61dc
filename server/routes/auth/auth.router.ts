import { Router, type Request } from 'express';
import { rateLimit, ipKeyGenerator, type Options } from 'express-rate-limit';
import { z } from 'zod';
import {
  acceptInvitationSchema,
  changePasswordSchema,
  preferencesSchema,
  requestResetSchema,
  signInSchema,
  tokenPasswordSchema,
} from '../../../shared/schemas/auth.schema';
import { actorOf, handle } from '../../middleware/handle';
import {
  clearSessionCookie,
  requireSignIn,
  setSessionCookie,
  type CookieSettings,
} from '../../middleware/authenticate';
import type { SessionKeys } from '../../lib/session';
import type { Mailer } from '../../mail/mailer';
import { User } from '../../db/associations';
import { NotFoundError } from '../../errors';
import * as auth from './auth.service';

export type AuthDeps = { keys: SessionKeys; cookie: CookieSettings; mailer: Mailer; appUrl: string };

const ip = (req: Request) => ipKeyGenerator(req.ip ?? '0.0.0.0');
const emailOf = (req: Request) =>
  String((req.body as { email?: unknown })?.email ?? '')
    .trim()
    .toLowerCase();

function limiter(opts: Partial<Options> & Pick<Options, 'limit' | 'windowMs' | 'keyGenerator'>) {
  return rateLimit({
    standardHeaders: 'draft-7',
    legacyHeaders: false,
    ...opts,
    handler: (req, res, _next, options) => {
      const resetTime = (req as Request & { rateLimit?: { resetTime?: Date } }).rateLimit?.resetTime;
      const seconds = resetTime
        ? Math.max(1, Math.ceil((resetTime.getTime() - Date.now()) / 1000))
        : Math.ceil(options.windowMs / 1000);
      res.set('Retry-After', String(seconds));
      res.status(429).json({
        error: { code: 'too_many_attempts', message: `Too many attempts. Try again in ${seconds} seconds.` },
      });
    },
  });
}

/**
 * Sign-in is throttled per address and per account-at-address, counting failures only: a stranger
 * elsewhere cannot lock a person out (ASVS 6.1.1, 6.3.1).
 */
function signInLimiters() {
  return [
    limiter({ windowMs: 15 * 60_000, limit: 50, keyGenerator: ip, skipSuccessfulRequests: true }),
    limiter({
      windowMs: 15 * 60_000,
      limit: 5,
      keyGenerator: (req) => `${emailOf(req)}|${ip(req)}`,
      skipSuccessfulRequests: true,
    }),
  ];
}

function resetLimiters() {
  return [
    limiter({ windowMs: 15 * 60_000, limit: 20, keyGenerator: ip }),
    limiter({ windowMs: 15 * 60_000, limit: 3, keyGenerator: (req) => `reset|${emailOf(req)}` }),
  ];
}

export function authRouter({ keys, cookie, mailer, appUrl }: AuthDeps) {
  const router = Router();

  const startSession = (res: Parameters<typeof setSessionCookie>[0], user: User) => {
    const now = Math.floor(Date.now() / 1000);
    const token = keys.sign({ sub: user.id, ws: user.workspaceId, tv: user.tokenVersion, at: now }, now);
    const claims = keys.verify(token)!;
    setSessionCookie(res, cookie, token, claims);
  };

  router.post(
    '/sign-in',
    ...signInLimiters(),
    handle({ body: signInSchema }, async ({ body, res }) => {
      const user = await auth.signIn(body.email, body.password);
      startSession(res, user);
      return auth.meOf(user);
    }),
  );

  router.post(
    '/sign-out',
    handle({}, async ({ req, res }) => {
      if (req.actor) await auth.endSessions(req.actor.userId);
      clearSessionCookie(res, cookie);
      res.status(204).end();
    }),
  );

  router.get(
    '/me',
    requireSignIn,
    handle({}, async ({ req }) => {
      const user = await User.findByPk(actorOf(req).userId);
      if (!user) throw new NotFoundError('User');
      return auth.meOf(user);
    }),
  );

  // The client asks this on load: 200 either way, so a signed-out visit is not an error in the console.
  router.get(
    '/session',
    handle({}, async ({ req }) => {
      const user = req.actor ? await User.findByPk(req.actor.userId) : null;
      return { me: user ? await auth.meOf(user) : null };
    }),
  );

  router.put(
    '/preferences',
    requireSignIn,
    handle({ body: preferencesSchema }, async ({ body, req }) => {
      const user = await auth.setPreferences(actorOf(req).userId, body.unitSystem);
      return auth.meOf(user);
    }),
  );

  router.post(
    '/password',
    requireSignIn,
    handle({ body: changePasswordSchema }, async ({ body, req, res }) => {
      const user = await auth.changePassword(actorOf(req).userId, body.currentPassword, body.newPassword);
      // Other sessions end (token version moved on); this one carries on with a fresh cookie.
      startSession(res, user);
      res.status(204).end();
    }),
  );

  router.post(
    '/reset-request',
    ...resetLimiters(),
    handle({ body: requestResetSchema }, async ({ body, res }) => {
      // Answer at once and alike whether or not the account exists; the mail goes out behind.
      auth.requestPasswordReset(body.email, mailer, appUrl).catch((err: Error) => {
        console.warn(`[mail] reset mail failed: ${err.message}`);
      });
      res.status(202).json({ message: 'If an account uses this e-mail, a reset link is on its way.' });
    }),
  );

  router.post(
    '/reset',
    ...resetLimiters().slice(0, 1),
    handle({ body: tokenPasswordSchema }, async ({ body, res }) => {
      await auth.resetPassword(body.token, body.password);
      res.status(204).end();
    }),
  );

  router.get(
    '/invitation/:token',
    handle({ params: z.object({ token: z.string().min(20).max(200) }) }, ({ params }) =>
      auth.describeInvitation(params.token),
    ),
  );

  router.post(
    '/accept-invitation',
    handle({ body: acceptInvitationSchema }, async ({ body, res }) => {
      const user = await auth.acceptInvitation(body.token, body.password, body.name);
      startSession(res, user);
      return auth.meOf(user);
    }),
  );

  return router;
}

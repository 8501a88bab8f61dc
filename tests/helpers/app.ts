import { randomBytes, randomUUID } from 'node:crypto';
import request from 'supertest';
import type { Express } from 'express';
import { createApp } from '../../server/app';
import { createSequelize } from '../../server/db/sequelize';
import { initModels } from '../../server/db/associations';
import { createSmtpMailer } from '../../server/mail/mailer';
import { startSmtpFake, type Mailbox } from '../../server/mail/smtp-fake';
import type { Sequelize } from 'sequelize';

export type TestApp = {
  app: Express;
  sequelize: Sequelize;
  mailbox: Mailbox;
  jwtSecret: string;
  close(): Promise<void>;
};

/**
 * The real app on the real database that `npm test` started, with e-mail going through nodemailer to a
 * local SMTP catcher on a free port. Each test file builds its own (fresh rate-limit counters).
 */
export async function startTestApp(opts: { trustProxy?: number } = {}): Promise<TestApp> {
  const url = process.env.DATABASE_URL;
  if (!url) throw new Error('DATABASE_URL is not set: run the tests with `npm test`');
  const sequelize = createSequelize(url);
  initModels(sequelize);
  const mailbox = await startSmtpFake({ port: 0 });
  const mailer = createSmtpMailer({
    host: '127.0.0.1',
    port: mailbox.port,
    from: 'Sowright <test@sowright.invalid>',
  });
  const jwtSecret = randomBytes(32).toString('base64url');
  const app = createApp({
    sequelize,
    jwtSecret,
    mailer,
    mailbox,
    appUrl: 'http://sowright.test',
    version: 'test',
    trustProxy: opts.trustProxy ?? 0,
  });
  return {
    app,
    sequelize,
    mailbox,
    jwtSecret,
    async close() {
      await mailbox.close();
      await sequelize.close();
    },
  };
}

/** A unique e-mail for a test person. */
export const uniqueEmail = (label: string) => `${label}-${randomUUID().slice(0, 8)}@test.example`;

/** A signed-in caller: every request carries the session cookie and the anti-forgery header. */
export class Caller {
  constructor(
    readonly app: Express,
    public cookie: string,
  ) {}
  get(url: string) {
    return request(this.app).get(url).set('Cookie', this.cookie);
  }
  post(url: string, body?: object) {
    return request(this.app)
      .post(url)
      .set('Cookie', this.cookie)
      .set('X-Sowright-Request', '1')
      .send(body ?? {});
  }
  put(url: string, body?: object) {
    return request(this.app)
      .put(url)
      .set('Cookie', this.cookie)
      .set('X-Sowright-Request', '1')
      .send(body ?? {});
  }
}

export function sessionCookieOf(res: { headers: Record<string, unknown> }): string {
  const raw = res.headers['set-cookie'];
  const list = Array.isArray(raw) ? (raw as string[]) : typeof raw === 'string' ? [raw] : [];
  const cookie = list.find((c) => c.startsWith('sowright_session=') && !c.startsWith('sowright_session=;'));
  if (!cookie) throw new Error(`no session cookie was set (got ${JSON.stringify(list)})`);
  return cookie.split(';')[0];
}

export async function signIn(app: Express, email: string, password: string): Promise<Caller> {
  const res = await request(app)
    .post('/api/auth/sign-in')
    .set('X-Sowright-Request', '1')
    .send({ email, password });
  if (res.status !== 200)
    throw new Error(`sign-in of ${email} answered ${res.status}: ${JSON.stringify(res.body)}`);
  return new Caller(app, sessionCookieOf(res));
}

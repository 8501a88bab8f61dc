import { randomBytes, randomUUID } from 'node:crypto';
import request from 'supertest';
import type { Express } from 'express';
import { closeApp, createApp } from '../../server/app';
import { createSequelize } from '../../server/db/sequelize';
import { initModels } from '../../server/db/associations';
import { createSmtpMailer } from '../../server/mail/mailer';
import { startSmtpFake, type Mailbox } from '../../server/mail/smtp-fake';
import type { Sequelize } from 'sequelize';
import { mkdtemp, rm } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { FileStore } from '../../server/logs/file-store';
import { startLogJobs } from '../../server/logs/log-jobs';
import { auditNotifier } from '../../server/routes/logs/log.mail';

export type TestApp = {
  app: Express;
  sequelize: Sequelize;
  mailbox: Mailbox;
  jwtSecret: string;
  files: FileStore;
  enqueueLog(logId: string): Promise<void>;
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
  // `npm test` gives the run one folder of log files (the demo's are there); otherwise one of our own.
  const sharedDir = process.env.SOWRIGHT_DATA_DIR;
  const dataDir = sharedDir ?? (await mkdtemp(path.join(tmpdir(), 'sowright-files-')));
  const files = new FileStore(dataDir);
  const notify = auditNotifier(mailer, 'http://sowright.test');
  const logJobs = await startLogJobs({
    sequelize,
    databaseUrl: url,
    files,
    onReady: (id) => notify(id, false),
  });
  const app = createApp({
    files,
    enqueueLog: (logId) => logJobs.enqueue(logId),
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
    files,
    enqueueLog: (logId: string) => logJobs.enqueue(logId),
    async close() {
      await logJobs.stop();
      if (!sharedDir) await rm(dataDir, { recursive: true, force: true });
      await mailbox.close();
      await closeApp(app);
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

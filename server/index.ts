import type { AddressInfo } from 'node:net';
import { loadEnv } from './config/env';
import { createSequelize } from './db/sequelize';
import { assertDurable } from './db/durability';
import { closeApp, createApp } from './app';
import { createSmtpMailer } from './mail/mailer';
import { startSmtpFake, type Mailbox } from './mail/smtp-fake';
import { APP_VERSION } from './lib/version';
import { FileStore } from './logs/file-store';
import { startLogJobs } from './logs/log-jobs';
import { auditNotifier } from './routes/logs/log.mail';

/** Listens, and shuts down cleanly on SIGINT/SIGTERM. Everything else lives in createApp(). */
async function main() {
  const env = loadEnv();
  const sequelize = createSequelize(env.DATABASE_URL);
  await sequelize.authenticate();
  await assertDurable(sequelize);

  let mailbox: Mailbox | null = null;
  if (env.SOWRIGHT_MAIL_FAKE) {
    mailbox = await startSmtpFake({ host: env.SOWRIGHT_SMTP_HOST, port: env.SOWRIGHT_SMTP_PORT });
  }
  const mailer = createSmtpMailer({
    host: env.SOWRIGHT_SMTP_HOST,
    port: mailbox?.port ?? env.SOWRIGHT_SMTP_PORT,
    from: env.MAIL_FROM,
  });
  const appUrl = env.APP_URL ?? `http://${env.SOWRIGHT_HOST}:${env.SOWRIGHT_PORT}`;
  const files = new FileStore(env.SOWRIGHT_DATA_DIR);
  const notify = auditNotifier(mailer, appUrl);
  const logJobs = await startLogJobs({
    sequelize,
    databaseUrl: env.DATABASE_URL,
    files,
    onReady: (logId) => notify(logId, false),
  });
  const app = createApp({
    files,
    enqueueLog: (logId) => logJobs.enqueue(logId),
    sequelize,
    jwtSecret: env.JWT_SECRET,
    mailer,
    mailbox,
    appUrl,
    version: APP_VERSION,
    cookieSecure: env.COOKIE_SECURE,
    trustProxy: env.TRUST_PROXY,
    clientDir: env.SOWRIGHT_CLIENT_DIR,
  });
  const server = app.listen(env.SOWRIGHT_PORT, env.SOWRIGHT_HOST);
  await new Promise<void>((resolve, reject) => {
    server.once('listening', resolve);
    server.once('error', reject);
  });
  const { port } = server.address() as AddressInfo;
  process.stdout.write(`[api] Sowright ${APP_VERSION} listening on http://${env.SOWRIGHT_HOST}:${port}\n`);
  if (mailbox)
    process.stdout.write(`[mail] catching e-mail on smtp://${env.SOWRIGHT_SMTP_HOST}:${mailbox.port}\n`);

  let stopping = false;
  const stop = async (signal: string) => {
    if (stopping) return;
    stopping = true;
    process.stdout.write(`[api] ${signal}: closing\n`);
    server.closeIdleConnections();
    await new Promise<void>((resolve) => server.close(() => resolve()));
    await logJobs.stop().catch(() => {});
    await mailbox?.close();
    await closeApp(app);
    await sequelize.close();
    process.exit(0);
  };
  process.on('SIGINT', () => void stop('SIGINT'));
  process.on('SIGTERM', () => void stop('SIGTERM'));
}

main().catch((err: Error) => {
  process.stderr.write(`[api] could not start: ${err.message}\n`);
  process.exit(1);
});

import { SMTPServer } from 'smtp-server';
import { simpleParser } from 'mailparser';
import { randomUUID } from 'node:crypto';
import type { AddressInfo } from 'node:net';

export type CaughtMail = {
  id: string;
  to: string[];
  from: string;
  subject: string;
  text: string;
  receivedAt: string;
};

export type Mailbox = {
  port: number;
  messages(): CaughtMail[];
  /** Resolves with the first message (old or new) that matches, or rejects after `timeoutMs`. */
  waitFor(match: (m: CaughtMail) => boolean, timeoutMs?: number): Promise<CaughtMail>;
  close(): Promise<void>;
};

const MAX_KEPT = 500;

/**
 * A local SMTP server standing in for a hosted mail service: it accepts every message on loopback and
 * keeps the last few hundred in memory, for the admin's mail outbox page and for tests.
 */
export async function startSmtpFake({ host = '127.0.0.1', port = 0 } = {}): Promise<Mailbox> {
  const caught: CaughtMail[] = [];
  const waiters = new Set<{ match: (m: CaughtMail) => boolean; resolve: (m: CaughtMail) => void }>();

  const server = new SMTPServer({
    authOptional: true,
    disabledCommands: ['STARTTLS'],
    logger: false,
    size: 1024 * 1024,
    onData(stream, session, callback) {
      simpleParser(stream)
        .then((parsed) => {
          const to = session.envelope.rcptTo.map((r) => r.address.toLowerCase());
          const mail: CaughtMail = {
            id: randomUUID(),
            to,
            from: session.envelope.mailFrom ? session.envelope.mailFrom.address : '',
            subject: parsed.subject ?? '',
            text: parsed.text ?? '',
            receivedAt: new Date().toISOString(),
          };
          caught.unshift(mail);
          caught.length = Math.min(caught.length, MAX_KEPT);
          for (const w of waiters) {
            if (w.match(mail)) {
              waiters.delete(w);
              w.resolve(mail);
            }
          }
          callback();
        })
        .catch((err: Error) => callback(err));
    },
  });
  server.on('error', (err) => console.warn(`[mail] ${err.message}`));

  await new Promise<void>((resolve, reject) => {
    server.once('error', reject);
    server.listen(port, host, () => resolve());
  });
  const address = (server as unknown as { server: { address(): AddressInfo } }).server.address();

  return {
    port: address.port,
    messages: () => [...caught],
    waitFor(match, timeoutMs = 5000) {
      const found = caught.find(match);
      if (found) return Promise.resolve(found);
      return new Promise((resolve, reject) => {
        const waiter = { match, resolve };
        waiters.add(waiter);
        setTimeout(() => {
          if (waiters.delete(waiter)) reject(new Error('no matching e-mail arrived in time'));
        }, timeoutMs).unref();
      });
    },
    close: () => new Promise((resolve) => server.close(() => resolve())),
  };
}

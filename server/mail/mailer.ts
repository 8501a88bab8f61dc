import nodemailer from 'nodemailer';

export type OutgoingMail = { to: string; subject: string; text: string };
export type Mailer = { send(mail: OutgoingMail): Promise<void> };

/** Sends through SMTP with nodemailer (in development and demo, to the local catcher). */
export function createSmtpMailer({ host, port, from }: { host: string; port: number; from: string }): Mailer {
  const transport = nodemailer.createTransport({
    host,
    port,
    secure: false,
    ignoreTLS: true,
    // The catcher on loopback accepts any login; a real relay is configured by these same settings.
    tls: { rejectUnauthorized: false },
  });
  return {
    async send(mail) {
      await transport.sendMail({ from, to: mail.to, subject: mail.subject, text: mail.text });
    },
  };
}

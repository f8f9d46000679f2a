// Outgoing e-mail over SMTP (nodemailer). By default the local fake mail server that
// `npm start` runs; any SMTP server by configuration. Only the outbox's sender
// (server/mail/outbox.ts) talks SMTP; everything else queues mail there.
import nodemailer from "nodemailer";
import type { Config } from "../config";

export interface MailMessage {
  to: string;
  subject: string;
  text: string;
  html?: string;
}

export interface Mailer {
  send(message: MailMessage): Promise<void>;
  close(): void;
}

/** An SMTP mailer for the configured server. */
export function createMailer(smtp: Config["smtp"]): Mailer {
  const transport = nodemailer.createTransport({
    host: smtp.host,
    port: smtp.port,
    secure: smtp.secure,
    auth: smtp.user ? { user: smtp.user, pass: smtp.pass ?? "" } : undefined,
    // The local fake server speaks plain SMTP; a real relay should offer STARTTLS.
    ignoreTLS: smtp.host === "127.0.0.1" || smtp.host === "localhost",
    connectionTimeout: 10_000,
  });
  return {
    async send(m) {
      await transport.sendMail({ from: smtp.from, to: m.to, subject: m.subject, text: m.text, html: m.html });
    },
    close: () => transport.close(),
  };
}

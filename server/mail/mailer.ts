import nodemailer, { type Transporter } from "nodemailer";
import type { Logger } from "../lib/logger.js";

export interface OutgoingMail {
  to: string;
  subject: string;
  text: string;
  html?: string | null;
  /** Fixed per message and reused on every retry, so a receiver can recognise a repeat. */
  messageId?: string;
}

/** Talks SMTP. Only the outbox worker uses it; everything else writes to the outbox. */
export interface SmtpTransport {
  deliver(mail: OutgoingMail): Promise<void>;
  close(): void;
}

/** Sends through SMTP_URL, or through the local sink when `sinkPort` is given instead. */
export function createSmtpTransport(options: { smtpUrl?: string; sinkPort?: number; from: string; logger: Logger }): SmtpTransport {
  const { from, logger } = options;
  let transport: Transporter;
  if (options.smtpUrl) {
    transport = nodemailer.createTransport(options.smtpUrl);
  } else if (options.sinkPort !== undefined) {
    // The sink speaks plain SMTP on loopback (its built-in certificate has expired; STACK.md).
    // No pooling: a sink that went away and came back must not be met with a dead socket.
    transport = nodemailer.createTransport({ host: "127.0.0.1", port: options.sinkPort, secure: false, ignoreTLS: true, connectionTimeout: 5000 });
  } else {
    throw new Error("mail needs SMTP_URL or a local sink");
  }
  return {
    async deliver(mail) {
      const info = await transport.sendMail({ from, to: mail.to, subject: mail.subject, text: mail.text, html: mail.html ?? undefined, messageId: mail.messageId });
      // Address and subject only: bodies carry sign-in and acknowledge links.
      logger.info({ to: mail.to, subject: mail.subject, messageId: info.messageId }, "mail sent");
    },
    close: () => transport.close(),
  };
}

import nodemailer, { type Transporter } from "nodemailer";
import type { Logger } from "../lib/logger.js";

export interface OutgoingMail {
  to: string | string[];
  subject: string;
  text: string;
}

export interface Mailer {
  send(mail: OutgoingMail): Promise<void>;
  close(): void;
}

/** Sends through SMTP_URL, or through the local sink when `sinkPort` is given instead. */
export function createMailer(options: { smtpUrl?: string; sinkPort?: number; from: string; logger: Logger }): Mailer {
  const { from, logger } = options;
  let transport: Transporter;
  if (options.smtpUrl) {
    transport = nodemailer.createTransport(options.smtpUrl);
  } else if (options.sinkPort !== undefined) {
    // The sink speaks plain SMTP on loopback (its built-in certificate has expired; STACK.md).
    transport = nodemailer.createTransport({ host: "127.0.0.1", port: options.sinkPort, secure: false, ignoreTLS: true });
  } else {
    throw new Error("mailer needs SMTP_URL or a local sink");
  }
  return {
    async send(mail) {
      const info = await transport.sendMail({ from, ...mail });
      // Addresses and subjects only: bodies may carry sign-in links.
      logger.info({ to: mail.to, subject: mail.subject, messageId: info.messageId }, "mail sent");
    },
    close: () => transport.close(),
  };
}

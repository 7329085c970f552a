import type { AddressInfo } from "node:net";
import { simpleParser } from "mailparser";
import { SMTPServer } from "smtp-server";
import type { DataSource } from "typeorm";
import { CaughtMailEntity } from "../db/entities/caught-mail.entity.js";
import type { Logger } from "../lib/logger.js";

export interface SmtpSink {
  port: number;
  close(): Promise<void>;
}

/** Largest message the sink keeps; ours are a few kilobytes. */
const MAX_MESSAGE_BYTES = 1024 * 1024;

/**
 * The local stand-in for a mail relay: a real SMTP server on loopback that stores every message it
 * is given in the database, so an admin can read the mail in the app (demo mode) and tests can
 * follow e-mailed links. It never relays anything.
 */
export async function startSmtpSink(dataSource: DataSource, logger: Logger, port = 0): Promise<SmtpSink> {
  const server = new SMTPServer({
    // smtp-server's built-in certificate has expired (STACK.md): plain SMTP on loopback only.
    secure: false,
    disabledCommands: ["STARTTLS"],
    authOptional: true,
    size: MAX_MESSAGE_BYTES,
    logger: false,
    onData(stream, session, callback) {
      const chunks: Buffer[] = [];
      stream.on("data", (c: Buffer) => chunks.push(c));
      stream.on("end", () => {
        if (stream.sizeExceeded) return callback(Object.assign(new Error("Message too large"), { responseCode: 552 }));
        const raw = Buffer.concat(chunks);
        simpleParser(raw)
          .then((parsed) =>
            dataSource.getRepository(CaughtMailEntity).insert({
              receivedAtMs: Date.now(),
              from: session.envelope.mailFrom ? session.envelope.mailFrom.address : "",
              to: JSON.stringify(session.envelope.rcptTo.map((r) => r.address)),
              subject: parsed.subject ?? "",
              text: parsed.text ?? "",
              raw: raw.toString("utf8"),
            }),
          )
          .then(
            () => callback(),
            (err: unknown) => {
              logger.error({ err }, "SMTP sink could not store a message");
              callback(err instanceof Error ? err : new Error(String(err)));
            },
          );
      });
    },
  });
  await new Promise<void>((resolve, reject) => {
    server.once("error", reject);
    server.listen(port, "127.0.0.1", () => resolve());
  });
  const boundPort = (server.server.address() as AddressInfo).port;
  logger.info({ port: boundPort }, "local SMTP sink listening (mail is kept, never relayed)");
  let closing: Promise<void> | null = null;
  return { port: boundPort, close: () => (closing ??= new Promise<void>((resolve) => server.close(() => resolve()))) };
}

import "server-only";
import { SMTPServer } from "smtp-server";
import { insertOutboxMessage } from "@/db/queries/outbox";
import { parseMessage } from "./parse";

export type FakeSmtpServer = { port: number; close: () => Promise<void> };

const MAX_MESSAGE_BYTES = 5 * 1024 * 1024;

/**
 * A local SMTP server for development and tests: accepts every message (with or without AUTH),
 * parses it minimally and stores it in outbox_messages for the outbox page.
 */
export function startFakeSmtpServer({ port, host = "127.0.0.1" }: { port: number; host?: string }): Promise<FakeSmtpServer> {
  const server = new SMTPServer({
    authOptional: true,
    disabledCommands: ["STARTTLS"],
    logger: false,
    size: MAX_MESSAGE_BYTES,
    onAuth(auth, _session, callback) {
      callback(null, { user: auth.username ?? "anyone" });
    },
    onData(stream, session, callback) {
      const chunks: Buffer[] = [];
      stream.on("data", (chunk: Buffer) => chunks.push(chunk));
      stream.on("error", (error) => callback(error));
      stream.on("end", () => {
        if (stream.sizeExceeded) {
          callback(Object.assign(new Error("Message too large"), { responseCode: 552 }));
          return;
        }
        const raw = Buffer.concat(chunks).toString("utf8");
        const parsed = parseMessage(raw);
        const envelopeFrom = session.envelope.mailFrom ? session.envelope.mailFrom.address : "";
        const envelopeTo = session.envelope.rcptTo.map((r) => r.address).join(", ");
        insertOutboxMessage({
          fromAddress: parsed.from || envelopeFrom,
          toAddress: parsed.to || envelopeTo,
          subject: parsed.subject,
          text: parsed.text,
          html: parsed.html,
          raw,
          receivedAt: new Date(),
        }).then(
          () => callback(),
          (error: unknown) => callback(error instanceof Error ? error : new Error(String(error))),
        );
      });
    },
  });
  return new Promise((resolve, reject) => {
    server.once("error", reject);
    server.listen(port, host, () => {
      server.off("error", reject);
      server.on("error", (error) => console.error("[fake-smtp]", error.message));
      const address = server.server.address();
      const actualPort = typeof address === "object" && address ? address.port : port;
      resolve({ port: actualPort, close: () => new Promise<void>((done) => server.close(() => done())) });
    });
  });
}

const globalForSmtp = globalThis as unknown as { portolanFakeSmtp?: Promise<FakeSmtpServer | null> };

/** Start the app's fake SMTP server once per process (survives dev reloads). Logs and continues if the port is taken. */
export function ensureFakeSmtpServer(port: number): Promise<FakeSmtpServer | null> {
  globalForSmtp.portolanFakeSmtp ??= startFakeSmtpServer({ port }).then(
    (server) => {
      console.log(`[fake-smtp] listening on 127.0.0.1:${server.port}; messages appear at /dev/outbox`);
      return server;
    },
    (error: unknown) => {
      console.warn(`[fake-smtp] not started on port ${port}: ${error instanceof Error ? error.message : String(error)}`);
      return null;
    },
  );
  return globalForSmtp.portolanFakeSmtp;
}

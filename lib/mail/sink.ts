/**
 * The local SMTP sink (smtp-server on 127.0.0.1): accepts every message without
 * authentication and stores it in a folder, one `<id>.eml` (the raw message as received) and
 * one `<id>.json` (the SMTP envelope: sender, recipients, time) per message. The admin inbox
 * page reads that folder. For development, demos and tests only; production gives a relay.
 */
import { mkdirSync, renameSync, writeFileSync } from "node:fs";
import { join } from "node:path";
import { randomBytes } from "node:crypto";
import { SMTPServer } from "smtp-server";

export interface SinkEnvelope {
  id: string;
  from: string | null;
  to: string[];
  receivedAt: string;
  size: number;
}

export interface RunningSink {
  port: number;
  dir: string;
  close: () => Promise<void>;
}

export async function startSmtpSink(options: { port: number; dir: string; host?: string }): Promise<RunningSink> {
  mkdirSync(options.dir, { recursive: true });
  const server = new SMTPServer({
    authOptional: true,
    disabledCommands: ["STARTTLS", "AUTH"],
    logger: false,
    size: 25 * 1024 * 1024,
    onData(stream, session, callback) {
      const chunks: Buffer[] = [];
      stream.on("data", (c: Buffer) => chunks.push(c));
      stream.on("error", callback);
      stream.on("end", () => {
        try {
          const raw = Buffer.concat(chunks);
          const id = `${Date.now()}-${randomBytes(4).toString("hex")}`;
          const envelope: SinkEnvelope = {
            id,
            from: session.envelope.mailFrom ? session.envelope.mailFrom.address : null,
            to: session.envelope.rcptTo.map((r) => r.address),
            receivedAt: new Date().toISOString(),
            size: raw.length,
          };
          // The .json is written last (and renamed into place): a reader that sees it sees the whole message.
          writeFileSync(join(options.dir, `${id}.eml`), raw);
          writeFileSync(join(options.dir, `.${id}.json.tmp`), JSON.stringify(envelope));
          renameSync(join(options.dir, `.${id}.json.tmp`), join(options.dir, `${id}.json`));
          callback();
        } catch (error) {
          callback(error as Error);
        }
      });
    },
  });
  await new Promise<void>((resolve, reject) => {
    server.once("error", reject);
    server.listen(options.port, options.host ?? "127.0.0.1", () => {
      server.off("error", reject);
      resolve();
    });
  });
  server.on("error", (e) => console.error(`smtp sink: ${e.message}`));
  return {
    port: options.port,
    dir: options.dir,
    close: () => new Promise<void>((resolve) => server.close(() => resolve())),
  };
}

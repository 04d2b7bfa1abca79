import "server-only";
import { existsSync, readdirSync, readFileSync } from "node:fs";
import { isAbsolute, join } from "node:path";
import { readEnv } from "@/lib/env";
import { inlineCidImages, parseMessage } from "@/lib/mail/mime";
import type { SinkEnvelope } from "@/lib/mail/sink";

/**
 * The local SMTP sink's inbox (the folder scripts/smtp-sink.ts writes), for the admin page in
 * development and demos. Enabled by SIDEREA_MAIL_INBOX=on (npm start and npm test set it
 * when they start the sink); off in production, where mail goes to a real relay.
 */
export function inboxEnabled(): boolean {
  return readEnv().SIDEREA_MAIL_INBOX === "on";
}

function sinkDir(): string {
  const dir = readEnv().SIDEREA_MAIL_SINK_DIR;
  return isAbsolute(dir) ? dir : join(process.cwd(), dir);
}

export interface InboxEntry {
  id: string;
  from: string;
  to: string[];
  subject: string;
  receivedAt: string;
  size: number;
}

/** Messages received, newest first (at most `limit`). */
export function listInbox(limit = 100): InboxEntry[] {
  const dir = sinkDir();
  if (!existsSync(dir)) return [];
  const files = readdirSync(dir).filter((f) => /^[\w-]+\.json$/.test(f)).sort().reverse().slice(0, limit);
  return files.map((f) => {
    const env = JSON.parse(readFileSync(join(dir, f), "utf8")) as SinkEnvelope;
    const mail = parseMessage(readFileSync(join(dir, `${env.id}.eml`)));
    return { id: env.id, from: mail.from || env.from || "", to: env.to, subject: mail.subject, receivedAt: env.receivedAt, size: env.size };
  });
}

/** One message: envelope, headers, text and HTML (inline images as data: URLs, for a sandboxed frame). */
export function readInboxMessage(id: string) {
  if (!/^[\w-]+$/.test(id)) return null;
  const dir = sinkDir();
  const envPath = join(dir, `${id}.json`);
  if (!existsSync(envPath)) return null;
  const env = JSON.parse(readFileSync(envPath, "utf8")) as SinkEnvelope;
  const mail = parseMessage(readFileSync(join(dir, `${id}.eml`)));
  return {
    id,
    envelopeFrom: env.from,
    envelopeTo: env.to,
    receivedAt: env.receivedAt,
    from: mail.from,
    to: mail.to,
    subject: mail.subject,
    date: mail.date,
    text: mail.text,
    html: mail.html ? inlineCidImages(mail.html, mail.attachments) : null,
    attachments: mail.attachments.map((a) => ({ contentType: a.contentType, filename: a.filename, contentId: a.contentId, size: a.size })),
  };
}

/**
 * SMTP transport options from the environment (lib/env.ts). A real relay works unchanged:
 * give SIDEREA_SMTP_URL (smtp:// or smtps:// with user and password) or the separate
 * SIDEREA_SMTP_HOST/PORT/USER/PASSWORD/SECURE. The defaults reach the local SMTP sink
 * (scripts/smtp-sink.ts) on 127.0.0.1:2525, which offers no TLS.
 */
import nodemailer, { type Transporter } from "nodemailer";
import type SMTPTransport from "nodemailer/lib/smtp-transport";
import type { Env } from "@/lib/env";

export function smtpOptions(env: Pick<Env, "SIDEREA_SMTP_URL" | "SIDEREA_SMTP_HOST" | "SIDEREA_SMTP_PORT" | "SIDEREA_SMTP_USER" | "SIDEREA_SMTP_PASSWORD" | "SIDEREA_SMTP_SECURE">): SMTPTransport.Options {
  const timeouts = { connectionTimeout: 10_000, greetingTimeout: 10_000, socketTimeout: 30_000 };
  if (env.SIDEREA_SMTP_URL) {
    const u = new URL(env.SIDEREA_SMTP_URL);
    const secure = u.protocol === "smtps:";
    return {
      host: u.hostname,
      port: u.port ? Number(u.port) : secure ? 465 : 587,
      secure,
      auth: u.username ? { user: decodeURIComponent(u.username), pass: decodeURIComponent(u.password) } : undefined,
      ...timeouts,
    };
  }
  const local = env.SIDEREA_SMTP_HOST === "127.0.0.1" || env.SIDEREA_SMTP_HOST === "localhost";
  return {
    host: env.SIDEREA_SMTP_HOST,
    port: env.SIDEREA_SMTP_PORT,
    secure: env.SIDEREA_SMTP_SECURE,
    auth: env.SIDEREA_SMTP_USER ? { user: env.SIDEREA_SMTP_USER, pass: env.SIDEREA_SMTP_PASSWORD ?? "" } : undefined,
    // The local sink speaks plain SMTP; a remote relay is asked for STARTTLS when it offers it.
    ignoreTLS: local && !env.SIDEREA_SMTP_SECURE,
    ...timeouts,
  };
}

export function createMailTransport(env: Parameters<typeof smtpOptions>[0]): Transporter<SMTPTransport.SentMessageInfo> {
  return nodemailer.createTransport(smtpOptions(env));
}

/**
 * Signed, expiring tokens for links that need no sign-in (the unsubscribe link of alert
 * e-mails). A token is `base64url(JSON payload) "." base64url(HMAC-SHA256(secret, payload))`
 * (HMAC: RFC 2104; SHA-256: FIPS 180-4). The payload names its purpose, the subscription, the
 * user, an expiry (Unix seconds) and a random nonce; the nonce lets the server make a link
 * work once (it records used nonces). No framework or database here.
 */
import { createHmac, randomBytes, timingSafeEqual } from "node:crypto";

export interface LinkPayload {
  /** What the link does; a token for one purpose is refused for another. */
  purpose: "unsubscribe";
  subscriptionId: number;
  userId: number;
  /** Expiry, Unix seconds. */
  expiresAtS: number;
  nonce: string;
}

export type LinkCheck = { ok: true; payload: LinkPayload } | { ok: false; reason: "malformed" | "bad-signature" | "expired" | "wrong-purpose" };

const b64 = (buf: Buffer) => buf.toString("base64url");

function mac(secret: string, body: string): Buffer {
  return createHmac("sha256", secret).update(body).digest();
}

/** Signs a payload; the nonce is drawn when not given. */
export function signLink(secret: string, payload: Omit<LinkPayload, "nonce"> & { nonce?: string }): string {
  if (secret.length < 16) throw new Error("the link secret must be at least 16 characters");
  const full: LinkPayload = { ...payload, nonce: payload.nonce ?? b64(randomBytes(12)) };
  const body = b64(Buffer.from(JSON.stringify(full), "utf8"));
  return `${body}.${b64(mac(secret, body))}`;
}

/** Verifies signature, purpose and expiry at `nowS` (Unix seconds). Constant-time signature comparison. */
export function verifyLink(secret: string, token: string, purpose: LinkPayload["purpose"], nowS = Date.now() / 1000): LinkCheck {
  const parts = token.split(".");
  if (parts.length !== 2 || !parts[0] || !parts[1]) return { ok: false, reason: "malformed" };
  const [body, sig] = parts as [string, string];
  const expected = mac(secret, body);
  const given = Buffer.from(sig, "base64url");
  if (given.length !== expected.length || !timingSafeEqual(given, expected)) return { ok: false, reason: "bad-signature" };
  let payload: LinkPayload;
  try {
    payload = JSON.parse(Buffer.from(body, "base64url").toString("utf8")) as LinkPayload;
  } catch {
    return { ok: false, reason: "malformed" };
  }
  if (typeof payload !== "object" || payload === null || typeof payload.expiresAtS !== "number" || typeof payload.nonce !== "string") return { ok: false, reason: "malformed" };
  if (payload.purpose !== purpose) return { ok: false, reason: "wrong-purpose" };
  if (!(nowS < payload.expiresAtS)) return { ok: false, reason: "expired" };
  return { ok: true, payload };
}

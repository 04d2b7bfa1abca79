import { webcrypto } from "node:crypto";
import { describe, expect, it } from "vitest";
import { signLink, verifyLink } from "@/lib/links/signed-link";

const SECRET = "unit-test-secret-0123456789abcdef";
const NOW_S = 1_800_000_000;
const base = { purpose: "unsubscribe" as const, subscriptionId: 12, userId: 34, expiresAtS: NOW_S + 3600 };

describe("signed expiring links (HMAC-SHA256, RFC 2104)", () => {
  it("round-trips the payload and signs with HMAC-SHA256 as WebCrypto computes it", async () => {
    const token = signLink(SECRET, { ...base, nonce: "n1" });
    const check = verifyLink(SECRET, token, "unsubscribe", NOW_S);
    expect(check).toEqual({ ok: true, payload: { ...base, nonce: "n1" } });
    // Independent route: WebCrypto's HMAC (SubtleCrypto) over the body verifies the signature.
    const [body, sig] = token.split(".") as [string, string];
    const key = await webcrypto.subtle.importKey("raw", new TextEncoder().encode(SECRET), { name: "HMAC", hash: "SHA-256" }, false, ["verify"]);
    expect(await webcrypto.subtle.verify("HMAC", key, Buffer.from(sig, "base64url"), new TextEncoder().encode(body))).toBe(true);
  });

  it("checks WebCrypto itself against RFC 4231 test case 2 (key 'Jefe')", async () => {
    const key = await webcrypto.subtle.importKey("raw", new TextEncoder().encode("Jefe"), { name: "HMAC", hash: "SHA-256" }, false, ["sign"]);
    const mac = Buffer.from(await webcrypto.subtle.sign("HMAC", key, new TextEncoder().encode("what do ya want for nothing?"))).toString("hex");
    expect(mac).toBe("5bdcc146bf60754e6a042426089575c75a003f089d2739839dec58b964ec3843");
  });

  it("refuses a changed payload, a changed signature, another secret and a malformed token", () => {
    const token = signLink(SECRET, base);
    const [body, sig] = token.split(".") as [string, string];
    const forged = Buffer.from(JSON.stringify({ ...JSON.parse(Buffer.from(body, "base64url").toString()), subscriptionId: 13 })).toString("base64url");
    expect(verifyLink(SECRET, `${forged}.${sig}`, "unsubscribe", NOW_S)).toEqual({ ok: false, reason: "bad-signature" });
    expect(verifyLink(SECRET, `${body}.${sig.slice(0, -1)}${sig.endsWith("A") ? "B" : "A"}`, "unsubscribe", NOW_S)).toEqual({ ok: false, reason: "bad-signature" });
    expect(verifyLink("another-secret-0123456789abcdef", token, "unsubscribe", NOW_S)).toEqual({ ok: false, reason: "bad-signature" });
    expect(verifyLink(SECRET, "no-dot-here", "unsubscribe", NOW_S)).toEqual({ ok: false, reason: "malformed" });
    expect(verifyLink(SECRET, ".", "unsubscribe", NOW_S)).toEqual({ ok: false, reason: "malformed" });
  });

  it("expires at its expiry second, not before", () => {
    const token = signLink(SECRET, base);
    expect(verifyLink(SECRET, token, "unsubscribe", base.expiresAtS - 1).ok).toBe(true);
    expect(verifyLink(SECRET, token, "unsubscribe", base.expiresAtS)).toEqual({ ok: false, reason: "expired" });
  });

  it("draws a fresh nonce per link, so each link can be used once on its own", () => {
    const a = verifyLink(SECRET, signLink(SECRET, base), "unsubscribe", NOW_S);
    const b = verifyLink(SECRET, signLink(SECRET, base), "unsubscribe", NOW_S);
    expect(a.ok && b.ok && a.payload.nonce !== b.payload.nonce).toBe(true);
    expect(() => signLink("short", base)).toThrow(/16 characters/);
  });
});

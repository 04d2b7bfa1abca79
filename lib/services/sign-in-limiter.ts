import "server-only";
import { QueryTypes } from "sequelize";
import { getDb } from "@/lib/db";
import { readEnv } from "@/lib/env";

/**
 * Slows password guessing: failures are counted per account and per client address in
 * PostgreSQL (so every app process shares the counts). After SIDEREA_SIGN_IN_MAX_FAILURES
 * failures inside SIDEREA_SIGN_IN_WINDOW_SECONDS the key is blocked for
 * SIDEREA_SIGN_IN_BLOCK_SECONDS, doubling with each further failure (at most 1 hour).
 */
export function limiterKeys(email: string, address: string): string[] {
  return [`account:${email.trim().toLowerCase()}`, `address:${address}`];
}

/** Seconds until the first of the keys is unblocked, or 0 when none is blocked. */
export async function blockedForSeconds(keys: string[], now = new Date()): Promise<number> {
  const rows = await getDb().sequelize.query<{ blocked_until: Date | null }>(
    "SELECT blocked_until FROM sign_in_failures WHERE key IN (:keys) AND blocked_until > :now",
    { replacements: { keys, now }, type: QueryTypes.SELECT },
  );
  let seconds = 0;
  for (const r of rows) if (r.blocked_until) seconds = Math.max(seconds, Math.ceil((r.blocked_until.getTime() - now.getTime()) / 1000));
  return seconds;
}

/** Counts one failure against each key; sets a block when the count reaches the limit. */
export async function recordFailure(keys: string[], now = new Date()): Promise<void> {
  const env = readEnv();
  const windowStart = new Date(now.getTime() - env.SIDEREA_SIGN_IN_WINDOW_SECONDS * 1000);
  for (const key of keys) {
    await getDb().sequelize.query(
      `INSERT INTO sign_in_failures (key, failures, window_started_at) VALUES (:key, 1, :now)
       ON CONFLICT (key) DO UPDATE SET
         failures = CASE WHEN sign_in_failures.window_started_at < :windowStart THEN 1 ELSE sign_in_failures.failures + 1 END,
         window_started_at = CASE WHEN sign_in_failures.window_started_at < :windowStart THEN :now ELSE sign_in_failures.window_started_at END`,
      { replacements: { key, now, windowStart } },
    );
    await getDb().sequelize.query(
      `UPDATE sign_in_failures
         SET blocked_until = :now::timestamptz + make_interval(secs => LEAST(3600, :blockSeconds * power(2, failures - :max)))
       WHERE key = :key AND failures >= :max`,
      { replacements: { key, now, max: env.SIDEREA_SIGN_IN_MAX_FAILURES, blockSeconds: env.SIDEREA_SIGN_IN_BLOCK_SECONDS } },
    );
  }
}

/** Clears the account's counter after a successful sign-in (the address keeps its count). */
export async function recordSuccess(email: string): Promise<void> {
  await getDb().sequelize.query("DELETE FROM sign_in_failures WHERE key = :key", {
    replacements: { key: `account:${email.trim().toLowerCase()}` },
  });
}

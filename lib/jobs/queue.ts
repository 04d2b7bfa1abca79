import PgBoss from "pg-boss";
import { readEnv } from "@/lib/env";

/**
 * The PostgreSQL-backed job queue (pg-boss). Jobs live in the database's `pgboss` schema, so
 * they survive restarts and any number of worker processes (on any machine that reaches the
 * database) can take them. The app only sends; lib/worker/main.ts works.
 */
export const QUEUES = {
  ingest: "siderea-ingest",
  analysis: "siderea-analysis",
  reproduction: "siderea-reproduction",
  verification: "siderea-verification",
  /** After an append: create the reruns of the dataset's watched analyses. */
  watchSchedule: "siderea-watch-schedule",
  /** One rerun of a watched analysis, then the alert rule on its result. */
  watchRun: "siderea-watch-run",
  /** One e-mail: an immediate alert, or a subscriber's daily digest. */
  mail: "siderea-mail",
  /** The scheduled daily digest (SIDEREA_DIGEST_CRON). */
  digest: "siderea-digest",
} as const;
export type QueueName = (typeof QUEUES)[keyof typeof QUEUES];

const holder = globalThis as unknown as { __sidereaBoss?: Promise<PgBoss> };

async function startBoss(): Promise<PgBoss> {
  const env = readEnv();
  const boss = new PgBoss({
    connectionString: env.DATABASE_URL,
    schema: "pgboss",
    max: 4,
    maintenanceIntervalSeconds: env.SIDEREA_JOB_MAINTENANCE_SECONDS,
  });
  boss.on("error", (error) => console.error(`job queue error: ${error.message}`));
  await boss.start();
  for (const name of Object.values(QUEUES)) {
    if (name === QUEUES.mail) {
      // Mail waits for a dead SMTP server: many retries, exponential backoff from
      // SIDEREA_MAIL_RETRY_DELAY_SECONDS. The delivery row keeps its state meanwhile, and the
      // worker's sweep sends again whatever is still pending after the retries ran out.
      await boss.createQueue(name, { name, retryLimit: env.SIDEREA_MAIL_RETRY_LIMIT, retryDelay: env.SIDEREA_MAIL_RETRY_DELAY_SECONDS, retryBackoff: true, expireInSeconds: 300 });
      continue;
    }
    // Retried twice. A worker killed mid-job leaves nothing stored (its transaction rolls back);
    // its job expires after SIDEREA_JOB_EXPIRE_SECONDS and is delivered again.
    await boss.createQueue(name, { name, retryLimit: 2, retryDelay: 5, retryBackoff: true, expireInSeconds: env.SIDEREA_JOB_EXPIRE_SECONDS });
  }
  return boss;
}

/** The process's queue client, started on first use. */
export function getBoss(): Promise<PgBoss> {
  holder.__sidereaBoss ??= startBoss().catch((error) => {
    holder.__sidereaBoss = undefined;
    throw error;
  });
  return holder.__sidereaBoss;
}

/** Sends a job; returns pg-boss's job id. */
export async function enqueue(queue: QueueName, data: object): Promise<string> {
  const id = await (await getBoss()).send(queue, data);
  if (!id) throw new Error(`the job queue refused a job for ${queue}`);
  return id;
}

export async function stopBoss(): Promise<void> {
  const boss = holder.__sidereaBoss;
  holder.__sidereaBoss = undefined;
  if (boss) await (await boss).stop({ graceful: true, wait: true });
}

import "server-only";
import pg from "pg";
import { Sequelize } from "sequelize";
import { initModels } from "@/models";
import { readEnv } from "./env";

type Db = { sequelize: Sequelize; models: ReturnType<typeof initModels> };

// One connection pool per process. Kept on globalThis so that Next.js development reloads
// reuse it instead of opening a new pool per reload.
const holder = globalThis as unknown as { __sidereaDb?: Db };

/** The process's database connection and models, created on first use from DATABASE_URL. */
export function getDb(): Db {
  if (!holder.__sidereaDb) {
    const env = readEnv();
    const sequelize = new Sequelize(env.DATABASE_URL, {
      dialect: "postgres",
      dialectModule: pg,
      logging: false,
      pool: { max: 10, idle: 10_000 },
    });
    holder.__sidereaDb = { sequelize, models: initModels(sequelize) };
  }
  return holder.__sidereaDb;
}

/**
 * A connection of Sequelize's pool as a plain node-postgres client, for what Sequelize cannot
 * do (COPY streams, session-level advisory locks). `release` returns it to the pool; safe to
 * call more than once.
 */
export async function acquireRawClient(): Promise<{ client: pg.PoolClient; release: () => Promise<void> }> {
  const manager = getDb().sequelize.connectionManager as unknown as {
    getConnection: () => Promise<pg.PoolClient>;
    releaseConnection: (c: pg.PoolClient) => Promise<void>;
  };
  const client = await manager.getConnection();
  let released = false;
  return {
    client,
    release: async () => {
      if (released) return;
      released = true;
      await manager.releaseConnection(client);
    },
  };
}

/** Runs `fn` with a raw client and always gives it back. */
export async function withRawClient<T>(fn: (client: pg.PoolClient) => Promise<T>): Promise<T> {
  const { client, release } = await acquireRawClient();
  try {
    return await fn(client);
  } finally {
    await release();
  }
}

/** Closes the pool (tests and scripts). */
export async function closeDb(): Promise<void> {
  const db = holder.__sidereaDb;
  holder.__sidereaDb = undefined;
  if (db) await db.sequelize.close();
}

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

/** Closes the pool (tests and scripts). */
export async function closeDb(): Promise<void> {
  const db = holder.__sidereaDb;
  holder.__sidereaDb = undefined;
  if (db) await db.sequelize.close();
}

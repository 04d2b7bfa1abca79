import "server-only";
import { QueryTypes } from "sequelize";
import { getDb } from "@/lib/db";

export interface Health {
  status: "ok" | "degraded";
  app: { status: "ok"; version: string; uptimeSeconds: number };
  database: { status: "ok" | "unreachable"; latencyMs?: number; migrations?: number; message?: string };
}

/** Checks the app and the database (a round trip and the count of applied migrations). */
export async function checkHealth(version: string): Promise<Health> {
  const app = { status: "ok" as const, version, uptimeSeconds: Math.round(process.uptime()) };
  const started = performance.now();
  try {
    const rows = await getDb().sequelize.query<{ n: string }>('SELECT count(*) AS n FROM "SequelizeMeta"', { type: QueryTypes.SELECT });
    const latencyMs = Math.round((performance.now() - started) * 10) / 10;
    return { status: "ok", app, database: { status: "ok", latencyMs, migrations: Number(rows[0]?.n ?? 0) } };
  } catch (error) {
    console.error(`health check: database unreachable: ${(error as Error).message}`);
    return { status: "degraded", app, database: { status: "unreachable", message: "The database did not answer." } };
  }
}

import { spawn, type ChildProcess } from "node:child_process";
import { QueryTypes } from "sequelize";
import { afterAll, describe, expect, it } from "vitest";
import { useTestDatabase } from "./database";
import { makeUser, requestAs } from "./auth-helpers";
import { POST as createRoute } from "@/app/api/datasets/route";
import { getDb } from "@/lib/db";
import { stopBoss } from "@/lib/jobs/queue";

const db = useTestDatabase();
// The queue is created by whichever process starts first (here: this one, on upload), with
// these settings: a job whose worker died expires after 3 s and is delivered again.
process.env.SIDEREA_JOB_EXPIRE_SECONDS = "3";
process.env.SIDEREA_JOB_MAINTENANCE_SECONDS = "1";
const workers: ChildProcess[] = [];

/** Starts the real worker process (`npm run worker`) against the test database. */
function startWorker(extraEnv: Record<string, string> = {}): ChildProcess {
  // node with tsx as a loader, not the tsx binary: the tsx binary runs node as a child
  // process, and killing the parent would leave the real worker running.
  const child = spawn(process.execPath, ["--import", "tsx", "--conditions=react-server", "lib/worker/main.ts"], {
    env: { ...process.env, DATABASE_URL: db.url(), SIDEREA_JOB_EXPIRE_SECONDS: "3", SIDEREA_JOB_MAINTENANCE_SECONDS: "1", SIDEREA_JOB_STALE_SECONDS: "1", ...extraEnv },
    stdio: ["ignore", "pipe", "pipe"],
  });
  child.stdout?.on("data", () => {});
  child.stderr?.on("data", (d) => process.stderr.write(`[worker] ${d}`));
  workers.push(child);
  return child;
}

async function upload(): Promise<{ id: string }> {
  const n = 60_000;
  let text = "id,time,zenith,azimuth,energy\n";
  for (let i = 0; i < n; i++) text += `w${i},${new Date(Date.UTC(2024, 0, 1) + i * 60_000).toISOString()},${(i * 7) % 60},${(i * 13) % 360},${1 + (i % 50)}\n`;
  const user = await makeUser("analyst");
  const site = await getDb().models.Site.create({ name: `Worker site ${Date.now()}`, latitudeDeg: 20, longitudeDeg: 100, heightM: 0, zenithMaxDeg: 60, azimuthConvention: "north-clockwise", areaKm2: null, notes: "", createdBy: user.id });
  const response = await createRoute(await requestAs(user.id, `/api/datasets?name=worker&siteId=${site.id}`, { method: "POST", body: text, duplex: "half" } as RequestInit));
  expect(response.status).toBe(202);
  return (await response.json()).job;
}

async function uploadState(id: string) {
  const [r] = await getDb().sequelize.query<{ status: string; rows_stored: string }>("SELECT status, rows_stored FROM uploads WHERE id = :id", { replacements: { id }, type: QueryTypes.SELECT });
  return { status: r!.status, rowsStored: Number(r!.rows_stored) };
}

async function waitFor<T>(what: string, fn: () => Promise<T | undefined>, timeoutMs: number): Promise<T> {
  const until = Date.now() + timeoutMs;
  for (;;) {
    const v = await fn();
    if (v !== undefined) return v;
    if (Date.now() > until) throw new Error(`timed out waiting for ${what}`);
    await new Promise((r) => setTimeout(r, 200));
  }
}

async function count(sql: string): Promise<number> {
  const [r] = await getDb().sequelize.query<{ n: string }>(sql, { type: QueryTypes.SELECT });
  return Number(r!.n);
}

afterAll(async () => {
  for (const w of workers) w.kill("SIGKILL");
  await stopBoss();
});

describe("ingestion jobs in the worker process", () => {
  it("leaves no rows when the worker is killed midway through storing, and finishes after a restart", async () => {
    const job = await upload();
    const first = startWorker({ SIDEREA_FAULT_STALL_INGEST_AFTER_ROWS: "20000" });
    await waitFor("rows stored midway", async () => {
      const s = await uploadState(job.id);
      return s.status === "storing" && s.rowsStored >= 20_000 ? s : undefined;
    }, 60_000);
    first.kill("SIGKILL");
    await new Promise((r) => first.once("exit", r));
    // The killed transaction rolled back: no events, no dataset.
    expect(await count("SELECT count(*) AS n FROM events")).toBe(0);
    expect(await count("SELECT count(*) AS n FROM datasets")).toBe(0);

    startWorker();
    const done = await waitFor("the job to finish after the restart", async () => {
      const s = await uploadState(job.id);
      return s.status === "done" ? s : undefined;
    }, 90_000);
    expect(done.rowsStored).toBe(60_000);
    expect(await count("SELECT count(*) AS n FROM events")).toBe(60_000);
    expect(await count("SELECT count(*) AS n FROM datasets WHERE status = 'ready'")).toBe(1);
  }, 180_000);
});

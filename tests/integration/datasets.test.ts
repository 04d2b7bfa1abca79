import { gzipSync } from "node:zlib";
import { EquatorFromVector, Observer, RotateVector, Rotation_HOR_EQJ, Spherical, VectorFromHorizon } from "astronomy-engine";
import { QueryTypes } from "sequelize";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { useTestDatabase } from "./database";
import { makeUser, requestAs } from "./auth-helpers";
import { GET as listRoute, POST as createRoute } from "@/app/api/datasets/route";
import { GET as detailRoute } from "@/app/api/datasets/[id]/route";
import { POST as appendRoute } from "@/app/api/datasets/[id]/batches/route";
import { GET as eventsRoute } from "@/app/api/datasets/[id]/events.csv/route";
import { POST as unblindRoute } from "@/app/api/datasets/[id]/unblind/route";
import { GET as jobRoute } from "@/app/api/jobs/[id]/route";
import { getDb } from "@/lib/db";
import { stopBoss } from "@/lib/jobs/queue";
import { runIngest } from "@/lib/services/ingest";

useTestDatabase();

let analyst: number;
let member: number;
let referee: number;
let siteId: number;

// An invented test site (not the demo array).
const SITE = { latitudeDeg: -35.2, longitudeDeg: -69.3, heightM: 1400 };

beforeAll(async () => {
  analyst = (await makeUser("analyst")).id;
  member = (await makeUser("member")).id;
  referee = (await makeUser("referee")).id;
  const site = await getDb().models.Site.create({ name: "Test array", ...SITE, zenithMaxDeg: 60, azimuthConvention: "north-clockwise", areaKm2: null, notes: "", createdBy: analyst });
  siteId = site.id;
});

afterAll(async () => {
  await stopBoss();
});

function csv(rows: string[], header = "id,time,zenith,azimuth,energy"): string {
  return `${header}\n${rows.join("\n")}\n`;
}

const GOOD_ROWS = [
  "ev-1,2024-03-01T12:00:00.000Z,10,0,12.5",
  "ev-2,2024-03-01T13:30:00.000Z,45.5,90,3.2",
  "ev-3,2024-06-15T02:10:00.500Z,59.9,270.25,",
  "ev-4,2025-01-10T22:00:00Z,0,123,100",
];

async function upload(body: BodyInit, params: Record<string, string> = {}, userId = analyst) {
  const qs = new URLSearchParams({ name: "Test data", siteId: String(siteId), ...params });
  const response = await createRoute(await requestAs(userId, `/api/datasets?${qs}`, { method: "POST", body, duplex: "half" } as RequestInit));
  return response;
}

/** Uploads, then runs the queued job in this process (as a worker would) and returns the job view. */
async function ingest(body: BodyInit, params: Record<string, string> = {}) {
  const response = await upload(body, params);
  expect(response.status).toBe(202);
  const { job } = await response.json();
  await runIngest(job.id);
  const jobResponse = await jobRoute(await requestAs(analyst, job.url), { params: Promise.resolve({ id: job.id }) });
  return (await jobResponse.json()).job;
}

async function eventCount(datasetId: number | null = null): Promise<number> {
  const [r] = await getDb().sequelize.query<{ n: string }>(
    datasetId === null ? "SELECT count(*) AS n FROM events" : "SELECT count(*) AS n FROM events WHERE dataset_id = :datasetId",
    { replacements: { datasetId }, type: QueryTypes.SELECT },
  );
  return Number(r!.n);
}

/** Reference conversion with astronomy-engine (STACK.md recipe), no refraction. */
function referenceRaDec(iso: string, zenithDeg: number, azimuthDeg: number): { raDeg: number; decDeg: number } {
  const time = new Date(iso);
  const observer = new Observer(SITE.latitudeDeg, SITE.longitudeDeg, SITE.heightM);
  const rot = Rotation_HOR_EQJ(time, observer);
  const vec = RotateVector(rot, VectorFromHorizon(new Spherical(90 - zenithDeg, azimuthDeg, 1), time, ""));
  const eq = EquatorFromVector(vec);
  return { raDeg: eq.ra * 15, decDeg: eq.dec };
}

function angularSeparationDeg(ra1: number, dec1: number, ra2: number, dec2: number): number {
  const r = Math.PI / 180;
  const c = Math.sin(dec1 * r) * Math.sin(dec2 * r) + Math.cos(dec1 * r) * Math.cos(dec2 * r) * Math.cos((ra1 - ra2) * r);
  return Math.acos(Math.min(1, c)) / r;
}

describe("uploading and storing event lists", () => {
  let datasetId: number;

  it("stores a good file with the right count and coordinates within 30 arcsec of astronomy-engine", async () => {
    const job = await ingest(csv(GOOD_ROWS));
    expect(job.status).toBe("done");
    expect(job.rowsStored).toBe(4);
    datasetId = job.datasetId;
    expect(await eventCount(datasetId)).toBe(4);
    const rows = await getDb().sequelize.query<{ event_id: string; ra_deg: number; dec_deg: number; energy_eev: number | null }>(
      "SELECT event_id, ra_deg, dec_deg, energy_eev FROM events WHERE dataset_id = :datasetId ORDER BY seq",
      { replacements: { datasetId }, type: QueryTypes.SELECT },
    );
    expect(rows.map((r) => r.event_id)).toEqual(["ev-1", "ev-2", "ev-3", "ev-4"]);
    expect(rows[2]!.energy_eev).toBeNull();
    GOOD_ROWS.forEach((line, i) => {
      const [, time, zenith, azimuth] = line.split(",");
      const ref = referenceRaDec(time!, Number(zenith), Number(azimuth));
      // METHODS section 2 target: within 30 arcsec of a full ICRS transformation.
      expect(angularSeparationDeg(rows[i]!.ra_deg, rows[i]!.dec_deg, ref.raDeg, ref.decDeg) * 3600).toBeLessThan(30);
    });
    const detail = await (await detailRoute(await requestAs(analyst, `/api/datasets/${datasetId}`), { params: Promise.resolve({ id: String(datasetId) }) })).json();
    expect(detail.dataset).toMatchObject({ version: 1, eventCount: 4, status: "ready" });
    expect(detail.dataset.contentHash).toMatch(/^[0-9a-f]{64}$/);
    expect(detail.dataset.summary.zenith.counts.reduce((a: number, b: number) => a + b, 0)).toBe(4);
  });

  it("refuses the same events again as a duplicate, naming the existing dataset", async () => {
    const job = await ingest(csv(GOOD_ROWS));
    expect(job.status).toBe("rejected");
    expect(job.report.duplicateOf.datasetId).toBe(datasetId);
    expect(job.report.reason).toMatch(/already stored/);
  });

  it("appends a batch, increments the version and keeps the first version's hash", async () => {
    const before = await (await detailRoute(await requestAs(analyst, `/api/datasets/${datasetId}`), { params: Promise.resolve({ id: String(datasetId) }) })).json();
    const response = await appendRoute(
      await requestAs(analyst, `/api/datasets/${datasetId}/batches`, { method: "POST", body: csv(["ev-5,2025-02-01T00:00:00Z,30,30,5"]), duplex: "half" } as RequestInit),
      { params: Promise.resolve({ id: String(datasetId) }) },
    );
    expect(response.status).toBe(202);
    const { job } = await response.json();
    expect((await runIngest(job.id)).status).toBe("done");
    const after = await (await detailRoute(await requestAs(analyst, `/api/datasets/${datasetId}`), { params: Promise.resolve({ id: String(datasetId) }) })).json();
    expect(after.dataset.version).toBe(2);
    expect(after.dataset.eventCount).toBe(5);
    expect(after.dataset.versions.map((v: { version: number }) => v.version)).toEqual([1, 2]);
    expect(after.dataset.versions[0].contentHash).toBe(before.dataset.contentHash);
    expect(after.dataset.contentHash).not.toBe(before.dataset.contentHash);
  });

  it("streams the converted table as CSV, and an older version on request", async () => {
    const response = await eventsRoute(await requestAs(analyst, `/api/datasets/${datasetId}/events.csv`), { params: Promise.resolve({ id: String(datasetId) }) });
    expect(response.status).toBe(200);
    const text = await response.text();
    const lines = text.trim().split("\n");
    expect(lines[0]).toBe("id,time,zenith,azimuth,energy,ra,dec,l,b");
    expect(lines).toHaveLength(6);
    expect(lines[1]).toMatch(/^ev-1,2024-03-01T12:00:00\.000Z,10,0,12\.5,/);
    const v1 = await eventsRoute(await requestAs(analyst, `/api/datasets/${datasetId}/events.csv?version=1`), { params: Promise.resolve({ id: String(datasetId) }) });
    expect((await v1.text()).trim().split("\n")).toHaveLength(5);
  });

  it("rejects a file with one bad row whole, storing nothing, and reports its line number", async () => {
    const before = await eventCount();
    const job = await ingest(csv(["a,2024-03-01T12:00:00Z,10,0,1", "b,2024-03-01T12:00:00Z,95,0,1", "c,2024-03-01T12:00:00Z,10,0,1"]));
    expect(job.status).toBe("rejected");
    expect(job.report.badRowCount).toBe(1);
    expect(job.report.badRows[0].line).toBe(3);
    expect(job.report.badRows[0].reason).toMatch(/zenith/i);
    expect(await eventCount()).toBe(before);
  });

  it("drops bad rows when asked and saves the count dropped", async () => {
    const job = await ingest(csv(["d1,2024-04-01T12:00:00Z,10,0,1", "d2,not-a-time,10,0,1", "d3,2024-04-01T13:00:00Z,10,-5,-1"]), { dropBadRows: "true", name: "Dropped" });
    expect(job.status).toBe("done");
    expect(job.rowsStored).toBe(1);
    const d = await getDb().models.Dataset.findByPk(job.datasetId);
    expect(d?.droppedRows).toBe(2);
  });

  it("gives clear errors for an empty file, a header-only file, a wrong delimiter and a truncated gzip", async () => {
    const empty = await upload("");
    expect(empty.status).toBe(422);
    expect((await empty.json()).error.message).toMatch(/empty/);

    const headerOnly = await ingest("id,time,zenith,azimuth,energy\n");
    expect(headerOnly.status).toBe("rejected");
    expect(headerOnly.report.reason).toMatch(/no events/);

    const semicolons = await ingest(csv(["x;2024-03-01T12:00:00Z;10;0;1"], "id;time;zenith;azimuth;energy"));
    expect(semicolons.status).toBe("rejected");
    expect(semicolons.report.reason).toMatch(/header/i);

    const gz = gzipSync(Buffer.from(csv(Array.from({ length: 2000 }, (_, i) => `t${i},2024-03-01T12:00:00Z,10,${i % 360},1`))));
    const truncated = await ingest(gz.subarray(0, Math.floor(gz.length / 2)));
    expect(truncated.status).toBe("rejected");
    expect(truncated.report.reason).toMatch(/gzip/);
  });

  it("reads a gzip-compressed file and a file with a UTF-8 byte-order mark", async () => {
    const gz = await ingest(gzipSync(Buffer.from(csv(["g1,2024-05-01T12:00:00Z,20,10,2"]))), { name: "Gzipped" });
    expect(gz.status).toBe("done");
    const bom = await ingest(`\uFEFF${csv(["b1,2024-05-02T12:00:00Z,20,10,2"])}`, { name: "With BOM" });
    expect(bom.status).toBe("done");
  });

  it("stores an SQL-looking id as plain text", async () => {
    const evil = "x'); DROP TABLE events; --";
    const job = await ingest(csv([`"${evil}",2024-05-03T12:00:00Z,20,10,2`]), { name: "Quoted" });
    expect(job.status).toBe("done");
    const [r] = await getDb().sequelize.query<{ event_id: string }>("SELECT event_id FROM events WHERE dataset_id = :id", {
      replacements: { id: job.datasetId },
      type: QueryTypes.SELECT,
    });
    expect(r!.event_id).toBe(evil);
  });

  it("refuses a 200 MB file over a 64 MiB limit with 413 and keeps nothing", async () => {
    process.env.SIDEREA_UPLOAD_MAX_BYTES = String(64 * 2 ** 20);
    try {
      const line = Buffer.from("big,2024-03-01T12:00:00Z,10,0,1\n".padEnd(100, " "));
      let sent = 0;
      const body = new ReadableStream<Uint8Array>({
        pull(controller) {
          if (sent >= 200 * 2 ** 20) return controller.close();
          const chunk = Buffer.alloc(1 << 20);
          for (let o = 0; o < chunk.length; o += line.length) line.copy(chunk, o);
          sent += chunk.length;
          controller.enqueue(chunk);
        },
      });
      const response = await upload(body, { name: "Too big" });
      expect(response.status).toBe(413);
      expect((await response.json()).error.message).toMatch(/64 MiB/);
      expect(sent).toBeLessThan(200 * 2 ** 20);
      const [r] = await getDb().sequelize.query<{ n: string }>("SELECT count(*) AS n FROM upload_chunks", { type: QueryTypes.SELECT });
      expect(Number(r!.n)).toBe(0);
    } finally {
      delete process.env.SIDEREA_UPLOAD_MAX_BYTES;
    }
  });

  it("keeps nothing of an upload whose body breaks off midway", async () => {
    let n = 0;
    const body = new ReadableStream<Uint8Array>({
      pull(controller) {
        if (n++ === 3) return controller.error(new Error("connection reset"));
        controller.enqueue(Buffer.from(csv(Array.from({ length: 10_000 }, (_, i) => `cut${n}-${i},2024-03-01T12:00:00Z,10,0,1`))));
      },
    });
    const response = await upload(body, { name: "Cut off" });
    expect(response.status).toBe(400);
    const [r] = await getDb().sequelize.query<{ n: string }>("SELECT count(*) AS n FROM uploads WHERE status = 'receiving'", { type: QueryTypes.SELECT });
    expect(Number(r!.n)).toBe(0);
  });
});

describe("blinding and roles on datasets", () => {
  it("shows shifted right ascensions while blinded, the truth after an audited unblinding", async () => {
    const job = await ingest(csv(["s1,2024-07-01T00:00:00Z,20,45,3", "s2,2024-07-01T06:00:00Z,30,200,4"]), { name: "Blinded", blinded: "true" });
    expect(job.status).toBe("done");
    const id = String(job.datasetId);
    const truth = await getDb().sequelize.query<{ ra_deg: number; dec_deg: number }>("SELECT ra_deg, dec_deg FROM events WHERE dataset_id = :id ORDER BY seq", {
      replacements: { id },
      type: QueryTypes.SELECT,
    });
    const blindedCsv = await (await eventsRoute(await requestAs(analyst, `/api/datasets/${id}/events.csv`), { params: Promise.resolve({ id }) })).text();
    const shown = blindedCsv.trim().split("\n").slice(1).map((l) => l.split(","));
    const shift0 = (((Number(shown[0]![5]) - truth[0]!.ra_deg) % 360) + 360) % 360;
    const shift1 = (((Number(shown[1]![5]) - truth[1]!.ra_deg) % 360) + 360) % 360;
    expect(shift0).toBeGreaterThan(1e-3);
    expect(Math.abs(shift0 - shift1)).toBeLessThan(1e-4);
    expect(Math.abs(Number(shown[0]![6]) - truth[0]!.dec_deg)).toBeLessThan(1e-5);

    const refused = await unblindRoute(
      await requestAs(member, `/api/datasets/${id}/unblind`, { method: "POST", body: JSON.stringify({ reason: "curious" }) }),
      { params: Promise.resolve({ id }) },
    );
    expect(refused.status).toBe(403);
    const ok = await unblindRoute(
      await requestAs(analyst, `/api/datasets/${id}/unblind`, { method: "POST", body: JSON.stringify({ reason: "analysis frozen and approved" }) }),
      { params: Promise.resolve({ id }) },
    );
    expect(ok.status).toBe(200);
    const open = (await (await eventsRoute(await requestAs(analyst, `/api/datasets/${id}/events.csv`), { params: Promise.resolve({ id }) })).text()).trim().split("\n").slice(1);
    expect(Math.abs(Number(open[0]!.split(",")[5]) - truth[0]!.ra_deg)).toBeLessThan(1e-5);
    const audit = await getDb().models.AuditEntry.findAll({ where: { action: "dataset.unblind", targetId: id } });
    expect(audit).toHaveLength(1);
  });

  it("refuses members and referees the dataset list and exports (403), and anonymous callers (401)", async () => {
    for (const userId of [member, referee]) {
      expect((await listRoute(await requestAs(userId, "/api/datasets"))).status).toBe(403);
      expect((await eventsRoute(await requestAs(userId, "/api/datasets/1/events.csv"), { params: Promise.resolve({ id: "1" }) })).status).toBe(403);
      expect((await upload("x", {}, userId)).status).toBe(403);
    }
    expect((await listRoute(await requestAs(null, "/api/datasets"))).status).toBe(401);
  });

  it("lists datasets filtered, sorted and paginated on the server", async () => {
    const all = await (await listRoute(await requestAs(analyst, "/api/datasets?sort=name&dir=asc&pageSize=2&page=1"))).json();
    expect(all.rows).toHaveLength(2);
    expect(all.total).toBeGreaterThan(2);
    expect(all.rows[0].name <= all.rows[1].name).toBe(true);
    const filtered = await (await listRoute(await requestAs(analyst, "/api/datasets?q=blind"))).json();
    expect(filtered.rows.map((r: { name: string }) => r.name)).toEqual(["Blinded"]);
    expect((await listRoute(await requestAs(analyst, "/api/datasets?pageSize=1000"))).status).toBe(422);
  });
});

describe("dataset count maps", () => {
  it("serves 12 Nside^2 little-endian Float32 counts in RING order that sum to the event count and match binning of the stored directions", async () => {
    const { GET: mapRoute } = await import("@/app/api/datasets/[id]/map/route");
    const { vectorsToPixels } = await import("@/lib/sky/healpix");
    const { lonLatDegToVectors } = await import("@/lib/sky/vectors");
    const rows = Array.from({ length: 300 }, (_, i) => `m${i},2024-08-0${1 + (i % 9)}T${String(i % 24).padStart(2, "0")}:10:00Z,${(i * 7) % 60},${(i * 37) % 360},5`);
    const job = await ingest(csv(rows), { name: "Mapped" });
    expect(job.status).toBe("done");
    const id = String(job.datasetId);
    const response = await mapRoute(await requestAs(analyst, `/api/datasets/${id}/map?nside=16`), { params: Promise.resolve({ id }) });
    expect(response.status).toBe(200);
    expect(response.headers.get("x-healpix-nside")).toBe("16");
    expect(response.headers.get("x-healpix-ordering")).toBe("RING");
    const bytes = new Uint8Array(await response.arrayBuffer());
    expect(bytes.byteLength).toBe(12 * 16 * 16 * 4);
    const counts = new Float32Array(bytes.buffer, bytes.byteOffset, bytes.byteLength / 4);
    expect(counts.reduce((a, b) => a + b, 0)).toBe(300);
    const stored = await getDb().sequelize.query<{ ra_deg: number; dec_deg: number }>("SELECT ra_deg, dec_deg FROM events WHERE dataset_id = :id", { replacements: { id }, type: QueryTypes.SELECT });
    const pix = vectorsToPixels(16, "ring", lonLatDegToVectors(stored.map((r) => r.ra_deg), stored.map((r) => r.dec_deg)));
    const expected = new Float32Array(12 * 16 * 16);
    for (const p of pix) expected[p]! += 1;
    expect(Array.from(counts)).toEqual(Array.from(expected));
    expect((await mapRoute(await requestAs(analyst, `/api/datasets/${id}/map?nside=3`), { params: Promise.resolve({ id }) })).status).toBe(422);
    expect((await mapRoute(await requestAs(member, `/api/datasets/${id}/map?nside=16`), { params: Promise.resolve({ id }) })).status).toBe(403);
  });
});

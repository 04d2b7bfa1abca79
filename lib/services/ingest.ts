import "server-only";
import { randomInt } from "node:crypto";
import { createGunzip } from "node:zlib";
import { Readable } from "node:stream";
import type { PoolClient } from "pg";
import { from as copyFrom } from "pg-copy-streams";
import { QueryTypes, type Transaction } from "sequelize";
import { getDb, withRawClient } from "@/lib/db";
import { copyOutRows } from "./copy-out";
import { CanonicalHasher } from "@/lib/datasets/canonical";
import { uploadLimits } from "@/lib/datasets/limits";
import { copyEscape as copyText, copyUnescape } from "@/lib/datasets/copy-text";
import { equatorialToGalactic, horizontalToEquatorial } from "@/lib/sky/coordinates";
import { EventCsvParser, type EventCsvResult, type EventTable } from "@/lib/sky/event-csv";
import { vectorsToPixels } from "@/lib/sky/healpix";
import { MappingSchema, type Mapping } from "@/lib/validations/dataset";
import { audit } from "./audit";
import { computeDatasetSummary } from "./dataset-summary";
import { requestWatchedReruns } from "./alerts";

/** The Nside of the fine NESTED index stored with every event (METHODS section 3). */
export const EVENT_INDEX_NSIDE = 1024;

interface UploadRow {
  id: string;
  user_id: number | null;
  dataset_id: number | null;
  file_name: string;
  options: UploadOptions;
  status: string;
}

/** What the upload request stored in uploads.options. */
export interface UploadOptions {
  mode: "new" | "append" | "verify";
  name?: string;
  description?: string;
  siteId?: number;
  mapping: Mapping;
  dropBadRows: boolean;
  blinded?: boolean;
}

export type IngestOutcome =
  | { status: "done"; datasetId: number; version: number; eventCount: number; batchCount: number; droppedRows: number; timings: Record<string, number> }
  | { status: "rejected"; reason: string }
  | { status: "skipped" };

async function setUpload(id: string, fields: Record<string, unknown>): Promise<void> {
  const keys = Object.keys(fields);
  const set = keys.map((k) => `${k} = :${k}`).join(", ");
  const replacements = Object.fromEntries(Object.entries(fields).map(([k, v]) => [k, v !== null && typeof v === "object" ? JSON.stringify(v) : v]));
  await getDb().sequelize.query(`UPDATE uploads SET ${set}, updated_at = now() WHERE id = :id`, { replacements: { ...replacements, id } });
}

/** Streams the stored chunks of an upload, one chunk at a time. */
async function* uploadBytes(id: string): AsyncGenerator<Buffer> {
  for (let n = 0; ; n++) {
    const rows = await getDb().sequelize.query<{ data: Buffer }>("SELECT data FROM upload_chunks WHERE upload_id = $1 AND n = $2", {
      bind: [id, n],
      type: QueryTypes.SELECT,
    });
    if (!rows[0]) return;
    yield rows[0].data;
  }
}

/** Parses the stored upload: gunzips when the file starts with the gzip magic bytes, decodes UTF-8 strictly, feeds the CSV parser. */
/** Parses a stored upload by id (for jobs other than ingestion, e.g. verifications). */
export async function parseStoredUpload(uploadId: string, mapping: Mapping): Promise<EventCsvResult | { ok: false; fatal: string }> {
  return parseUpload({ id: uploadId } as UploadRow, mapping, false);
}

/** Deletes the stored bytes of an upload. */
export async function discardUploadBytes(uploadId: string): Promise<void> {
  await getDb().sequelize.query("DELETE FROM upload_chunks WHERE upload_id = :id", { replacements: { id: uploadId } });
}

async function parseUpload(upload: UploadRow, mapping: Mapping, dropBadRows: boolean): Promise<EventCsvResult | { ok: false; fatal: string }> {
  const parser = new EventCsvParser({
    timeFormat: mapping.timeFormat,
    azimuthConvention: mapping.azimuthConvention,
    energyUnit: mapping.energyUnit,
    badRows: dropBadRows ? "drop" : "reject",
    columns: Object.fromEntries(Object.entries(mapping.columns).filter(([, v]) => v)),
  });
  const decoder = new TextDecoder("utf-8", { fatal: true });
  const source = Readable.from(uploadBytes(upload.id));
  let stream: AsyncIterable<Buffer> = source;
  let lines = 0;
  let lastReport = 0;
  const first = await peekFirst(upload.id);
  const gz = first !== null && first[0] === 0x1f && first[1] === 0x8b;
  if (gz) stream = source.pipe(createGunzip());
  try {
    for await (const chunk of stream) {
      const text = decoder.decode(chunk, { stream: true });
      for (let i = text.indexOf("\n"); i !== -1; i = text.indexOf("\n", i + 1)) lines++;
      parser.feed(text);
      if (lines - lastReport > 100_000) {
        lastReport = lines;
        await setUpload(upload.id, { rows_read: Math.max(0, lines - 1) });
      }
    }
    parser.feed(decoder.decode());
  } catch (error) {
    const code = (error as NodeJS.ErrnoException).code;
    if (code === "Z_BUF_ERROR" || code === "Z_DATA_ERROR" || /unexpected end of file/i.test(String(error))) {
      return { ok: false, fatal: "The gzip file is truncated or corrupt: it ends before its data does. Upload it again." };
    }
    if (error instanceof TypeError) return { ok: false, fatal: `The file is not valid UTF-8 text (after about line ${lines + 1}).` };
    throw error;
  }
  await setUpload(upload.id, { rows_read: Math.max(0, lines - 1) });
  return parser.end();
}

async function peekFirst(id: string): Promise<Buffer | null> {
  const rows = await getDb().sequelize.query<{ data: Buffer }>("SELECT substring(data from 1 for 2) AS data FROM upload_chunks WHERE upload_id = :id AND n = 0", {
    replacements: { id },
    type: QueryTypes.SELECT,
  });
  return rows[0]?.data ?? null;
}

/** The pg client of a Sequelize transaction (Sequelize keeps it on the transaction). */
function clientOf(t: Transaction): PoolClient {
  return (t as unknown as { connection: PoolClient }).connection;
}

/** Feeds the canonical rows already stored for a dataset, in seq order, into the hasher. */
async function hashStoredRows(client: PoolClient, datasetId: number, hasher: CanonicalHasher): Promise<void> {
  const query = `SELECT event_id, unix_ms, zenith_deg, azimuth_deg, energy_eev FROM events WHERE dataset_id = ${Number(datasetId)} ORDER BY seq`;
  for await (const rows of copyOutRows(client, query)) {
    for (const f of rows) hasher.add(copyUnescape(f[0]!), Number(f[1]), Number(f[2]), Number(f[3]), f[4] === "\\N" ? NaN : Number(f[4]));
  }
}

/**
 * Fault injection for the tests of interrupted ingestion: with SIDEREA_FAULT_STALL_INGEST_AFTER_ROWS
 * set, the job stops for a minute once that many rows are written, mid-transaction, so a test can
 * kill the worker there. Never set in production.
 */
async function faultStall(rowsWritten: number): Promise<void> {
  const after = Number(process.env.SIDEREA_FAULT_STALL_INGEST_AFTER_ROWS);
  if (Number.isFinite(after) && after > 0 && rowsWritten >= after) {
    console.log(`fault injection: ingestion stalled after ${rowsWritten} rows`);
    await new Promise((resolve) => setTimeout(resolve, 60_000));
  }
}

/** Writes the converted batch with COPY, reporting progress. */
async function copyEvents(
  client: PoolClient,
  datasetId: number,
  version: number,
  seqStart: number,
  table: EventTable,
  conv: { raDeg: Float64Array; decDeg: Float64Array; lDeg: Float64Array; bDeg: Float64Array; ipix: Int32Array },
  onProgress: (stored: number) => Promise<void>,
): Promise<void> {
  const stream = client.query(
    copyFrom("COPY events (dataset_id, seq, version, event_id, unix_ms, zenith_deg, azimuth_deg, energy_eev, ra_deg, dec_deg, l_deg, b_deg, ipix_nest_1024) FROM STDIN"),
  );
  const done = new Promise<void>((resolve, reject) => {
    stream.on("finish", resolve);
    stream.on("error", reject);
  });
  const BATCH = 20_000;
  for (let start = 0; start < table.n; start += BATCH) {
    const end = Math.min(table.n, start + BATCH);
    let text = "";
    for (let i = start; i < end; i++) {
      const e = table.energyEeV[i]!;
      text += `${datasetId}\t${seqStart + i}\t${version}\t${copyText(table.ids[i]!)}\t${table.unixMs[i]}\t${table.zenithDeg[i]}\t${table.azimuthDeg[i]}\t${Number.isNaN(e) ? "\\N" : e}\t${conv.raDeg[i]}\t${conv.decDeg[i]}\t${conv.lDeg[i]}\t${conv.bDeg[i]}\t${conv.ipix[i]}\n`;
    }
    if (!stream.write(text)) await new Promise<void>((resolve) => stream.once("drain", () => resolve()));
    await onProgress(end);
    await faultStall(end);
  }
  stream.end();
  await done;
}

/** Rejects an upload: nothing is stored, the raw file is discarded, the report says why. */
async function reject(uploadId: string, reason: string, report: Record<string, unknown>): Promise<IngestOutcome> {
  await getDb().sequelize.query("DELETE FROM upload_chunks WHERE upload_id = :id", { replacements: { id: uploadId } });
  await setUpload(uploadId, { status: "rejected", report: { reason, ...report } });
  return { status: "rejected", reason };
}

/**
 * The ingestion job: parse and validate the stored upload (METHODS section 1), convert every
 * event with the sky core (ICRS RA/Dec, galactic l/b, NESTED index at Nside 1024), refuse
 * duplicates by the SHA-256 of the canonical table, and store the batch with COPY inside one
 * transaction together with the new dataset version: an interrupted job stores nothing.
 * Idempotent: a finished or rejected upload is skipped when its job is delivered again.
 */
export async function runIngest(uploadId: string): Promise<IngestOutcome> {
  // One worker per upload: a session-level advisory lock, released by PostgreSQL when the
  // worker's connection ends (also when the worker is killed).
  return withRawClient(async (lockClient) => {
    const { rows } = await lockClient.query<{ ok: boolean }>("SELECT pg_try_advisory_lock(hashtext($1)) AS ok", [`siderea-ingest:${uploadId}`]);
    if (!rows[0]?.ok) return { status: "skipped" } as const;
    try {
      return await ingestLocked(uploadId);
    } finally {
      await lockClient.query("SELECT pg_advisory_unlock(hashtext($1))", [`siderea-ingest:${uploadId}`]);
    }
  });
}

/**
 * Uploads whose job was lost (queued, parsing or storing, no progress for `staleSeconds`, and
 * no worker holding their lock): the worker sweeps for them at start and every minute and
 * runs them again. Returns the ids it took.
 */
export async function recoverStaleIngests(staleSeconds: number): Promise<string[]> {
  const rows = await getDb().sequelize.query<{ id: string }>(
    "SELECT id FROM uploads WHERE status IN ('queued', 'parsing', 'storing') AND options->>'mode' IN ('new', 'append') AND updated_at < now() - make_interval(secs => :stale) ORDER BY created_at",
    { replacements: { stale: staleSeconds }, type: QueryTypes.SELECT },
  );
  const taken: string[] = [];
  for (const r of rows) {
    const outcome = await runIngest(r.id);
    if (outcome.status !== "skipped") taken.push(r.id);
  }
  return taken;
}

async function ingestLocked(uploadId: string): Promise<IngestOutcome> {
  const { sequelize, models } = getDb();
  const timings: Record<string, number> = {};
  let mark = performance.now();
  const lap = (name: string) => {
    const now = performance.now();
    timings[name] = Math.round(now - mark) / 1000;
    mark = now;
  };
  const rows = await sequelize.query<UploadRow>("SELECT id, user_id, dataset_id, file_name, options, status FROM uploads WHERE id = :id", {
    replacements: { id: uploadId },
    type: QueryTypes.SELECT,
  });
  const upload = rows[0];
  if (!upload || upload.status === "done" || upload.status === "rejected") return { status: "skipped" };
  // Uploads of other kinds (a verification's events) are not datasets.
  if (upload.options.mode !== "new" && upload.options.mode !== "append") return { status: "skipped" };
  const options = upload.options;
  await setUpload(uploadId, { status: "parsing", rows_read: 0, rows_stored: 0 });

  // Site and mapping: a new dataset names its site; an append uses the dataset's own.
  let site: { latitudeDeg: number; longitudeDeg: number; heightM: number };
  let mapping: Mapping;
  if (options.mode === "append") {
    const dataset = await models.Dataset.findByPk(upload.dataset_id ?? -1);
    if (!dataset) return reject(uploadId, "The dataset to append to no longer exists.", {});
    const s = await models.Site.findByPk(dataset.siteId);
    if (!s) return reject(uploadId, "The dataset's site no longer exists.", {});
    site = s;
    mapping = MappingSchema.parse(dataset.mapping);
  } else {
    const s = await models.Site.findByPk(options.siteId ?? -1);
    if (!s) return reject(uploadId, "The chosen site does not exist.", {});
    site = s;
    mapping = MappingSchema.parse(options.mapping);
  }

  // Parse and validate.
  const parsed = await parseUpload(upload, mapping, options.dropBadRows);
  if ("fatal" in parsed) return reject(uploadId, parsed.fatal, {});
  if (!parsed.ok) {
    const header = "headerError" in parsed && parsed.headerError;
    return reject(
      uploadId,
      header ? `The header cannot be used: ${parsed.headerError}` : `${parsed.badRowCount} bad row${parsed.badRowCount === 1 ? "" : "s"}: nothing was stored. Fix them, or choose to drop bad rows.`,
      { badRowCount: parsed.badRowCount, badRows: parsed.badRows },
    );
  }
  const table = parsed.table;
  lap("parseSeconds");
  if (table.n === 0) return reject(uploadId, "The file has a header but no events.", { badRowCount: parsed.badRowCount, badRows: parsed.badRows });
  const { maxRows } = uploadLimits();
  if (table.n > maxRows) return reject(uploadId, `The file has ${table.n} events, more than the limit of ${maxRows} (SIDEREA_UPLOAD_MAX_ROWS). Split it into batches.`, {});

  // Duplicate detection by the canonical batch hash.
  const batchHasher = new CanonicalHasher();
  for (let i = 0; i < table.n; i++) batchHasher.add(table.ids[i]!, table.unixMs[i]!, table.zenithDeg[i]!, table.azimuthDeg[i]!, table.energyEeV[i]!);
  const batchHash = batchHasher.digest();
  const dup = await sequelize.query<{ dataset_id: number; version: number }>(
    "SELECT dataset_id, version FROM dataset_versions WHERE batch_hash = :h OR content_hash = :h ORDER BY dataset_id LIMIT 1",
    { replacements: { h: batchHash }, type: QueryTypes.SELECT },
  );
  if (dup[0]) {
    return reject(uploadId, `These events are already stored: dataset ${dup[0].dataset_id}, version ${dup[0].version}.`, {
      duplicateOf: { datasetId: dup[0].dataset_id, version: dup[0].version, url: `/data/${dup[0].dataset_id}` },
      batchHash,
    });
  }

  lap("hashSeconds");
  // Convert with the sky core. Azimuths are north-clockwise after parsing.
  const eq = horizontalToEquatorial({ zenithDeg: table.zenithDeg, azimuthDeg: table.azimuthDeg, unixMs: table.unixMs }, site, { azimuthConvention: "north-clockwise" });
  const gal = equatorialToGalactic(eq.raDeg, eq.decDeg);
  const ipix = vectorsToPixels(EVENT_INDEX_NSIDE, "nested", eq);
  const conv = { raDeg: eq.raDeg, decDeg: eq.decDeg, lDeg: gal.lDeg, bDeg: gal.bDeg, ipix };

  lap("convertSeconds");
  // Store: one transaction for the events, the version and the dataset row.
  await setUpload(uploadId, { status: "storing" });
  const outcome = await sequelize.transaction(async (t) => {
    const client = clientOf(t);
    let datasetId: number;
    let version: number;
    let seqStart: number;
    let dropped = parsed.droppedRows;
    if (options.mode === "append") {
      const [locked] = await sequelize.query<{ id: number; version: number; event_count: string; dropped_rows: number }>(
        "SELECT id, version, event_count, dropped_rows FROM datasets WHERE id = :id FOR UPDATE",
        { replacements: { id: upload.dataset_id }, type: QueryTypes.SELECT, transaction: t },
      );
      if (!locked) throw new Error("dataset vanished during append");
      datasetId = locked.id;
      version = locked.version + 1;
      seqStart = Number(locked.event_count);
      dropped += locked.dropped_rows;
    } else {
      const created = await models.Dataset.create(
        {
          name: options.name ?? upload.file_name,
          description: options.description ?? "",
          siteId: options.siteId!,
          ownerId: upload.user_id,
          status: "ingesting",
          contentHash: null,
          timeStart: null,
          timeEnd: null,
          mapping,
          blinded: Boolean(options.blinded),
          blindSeed: options.blinded ? String(randomInt(1, 2 ** 47)) : null,
          unblindedAt: null,
          summary: null,
        },
        { transaction: t },
      );
      datasetId = created.id;
      version = 1;
      seqStart = 0;
    }
    await copyEvents(client, datasetId, version, seqStart, table, conv, async (stored) => {
      await setUpload(uploadId, { rows_stored: stored });
    });

    lap("copySeconds");
    // Content hash of the whole table after this batch.
    let contentHash = batchHash;
    if (version > 1) {
      const full = new CanonicalHasher();
      await hashStoredRows(client, datasetId, full);
      contentHash = full.digest();
    }
    const eventCount = seqStart + table.n;
    await sequelize.query(
      `INSERT INTO dataset_versions (dataset_id, version, content_hash, batch_hash, event_count, batch_event_count, dropped_rows, created_by, created_at)
       VALUES (:datasetId, :version, :contentHash, :batchHash, :eventCount, :batchCount, :dropped, :userId, now())`,
      { replacements: { datasetId, version, contentHash, batchHash, eventCount, batchCount: table.n, dropped: parsed.droppedRows, userId: upload.user_id }, transaction: t },
    );
    lap("versionHashSeconds");
    const summary = await computeDatasetSummary(datasetId, t);
    lap("summarySeconds");
    await sequelize.query(
      `UPDATE datasets SET version = :version, content_hash = :contentHash, event_count = :eventCount, dropped_rows = :dropped,
         status = 'ready', summary = :summary,
         time_start = (SELECT to_timestamp(min(unix_ms) / 1000) FROM events WHERE dataset_id = :datasetId),
         time_end = (SELECT to_timestamp(max(unix_ms) / 1000) FROM events WHERE dataset_id = :datasetId),
         updated_at = now()
       WHERE id = :datasetId`,
      { replacements: { version, contentHash, eventCount, dropped, datasetId, summary: JSON.stringify(summary) }, transaction: t },
    );
    return { datasetId, version, eventCount, dropped };
  });

  lap("commitSeconds");
  await sequelize.query("DELETE FROM upload_chunks WHERE upload_id = :id", { replacements: { id: uploadId } });
  await setUpload(uploadId, {
    status: "done",
    dataset_id: outcome.datasetId,
    rows_stored: table.n,
    report: { droppedRows: parsed.droppedRows, badRowCount: parsed.badRowCount, badRows: parsed.badRows, version: outcome.version, batchHash, timings },
  });
  await audit({
    actorId: upload.user_id,
    action: options.mode === "append" ? "dataset.append" : "dataset.create",
    targetType: "dataset",
    targetId: outcome.datasetId,
    details: { version: outcome.version, events: table.n, droppedRows: parsed.droppedRows, blinded: Boolean(options.blinded) },
  });
  // After the commit: queue the reruns of watched analyses (never waits on them or on mail).
  if (options.mode === "append") await requestWatchedReruns(outcome.datasetId, outcome.version);
  return { status: "done", datasetId: outcome.datasetId, version: outcome.version, eventCount: outcome.eventCount, batchCount: table.n, droppedRows: parsed.droppedRows, timings };
}

/** Marks an upload failed (the job gave up after its retries). */
export async function failIngest(uploadId: string, message: string): Promise<void> {
  await setUpload(uploadId, { status: "failed", report: { reason: message } });
}

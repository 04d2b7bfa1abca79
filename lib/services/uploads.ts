import "server-only";
import { randomUUID } from "node:crypto";
import { QueryTypes } from "sequelize";
import { getDb } from "@/lib/db";
import { HttpError } from "@/lib/http";
import { enqueue, QUEUES } from "@/lib/jobs/queue";
import { uploadLimits } from "@/lib/datasets/limits";

const CHUNK_BYTES = 1 << 20;

export interface UploadTarget {
  userId: number;
  datasetId: number | null;
  fileName: string;
  options: Record<string, unknown>;
}

/**
 * Receives an upload body as a stream into PostgreSQL (1 MiB chunks, never the whole file in
 * memory), enforcing the size limit, then queues the ingestion job. Returns the upload id,
 * which is also the id of its job at /api/jobs/:id.
 */
export async function receiveUpload(body: ReadableStream<Uint8Array> | null, target: UploadTarget, options: { queue?: boolean } = {}): Promise<string> {
  if (!body) throw new HttpError(400, "bad_request", "The request has no body: send the CSV file as the request body.");
  const { maxBytes } = uploadLimits();
  const { sequelize } = getDb();
  const id = randomUUID();
  await sequelize.query(
    `INSERT INTO uploads (id, user_id, dataset_id, file_name, options, status, created_at, updated_at)
     VALUES (:id, :userId, :datasetId, :fileName, :options, 'receiving', now(), now())`,
    { replacements: { id, userId: target.userId, datasetId: target.datasetId, fileName: target.fileName, options: JSON.stringify(target.options) } },
  );
  let total = 0;
  let n = 0;
  let pending: Uint8Array[] = [];
  let pendingBytes = 0;
  const flush = async () => {
    if (pendingBytes === 0) return;
    const data = Buffer.concat(pending, pendingBytes);
    pending = [];
    pendingBytes = 0;
    // Bound parameters: the chunk travels as binary, not as an escaped SQL literal.
    await sequelize.query("INSERT INTO upload_chunks (upload_id, n, data) VALUES ($1, $2, $3)", { bind: [id, n++, data] });
  };
  try {
    const reader = body.getReader();
    for (;;) {
      const { done, value } = await reader.read();
      if (done) break;
      total += value.byteLength;
      if (total > maxBytes) {
        await reader.cancel();
        throw new HttpError(413, "payload_too_large", `The file is larger than the limit of ${Math.round(maxBytes / 2 ** 20)} MiB (SIDEREA_UPLOAD_MAX_BYTES). Split it into batches and append them.`);
      }
      pending.push(value);
      pendingBytes += value.byteLength;
      if (pendingBytes >= CHUNK_BYTES) await flush();
    }
    await flush();
    if (total === 0) throw new HttpError(422, "validation_failed", "The file is empty.", [{ path: "file", message: "No bytes received." }]);
  } catch (error) {
    await sequelize.query("DELETE FROM uploads WHERE id = :id", { replacements: { id } });
    if (error instanceof HttpError) throw error;
    throw new HttpError(400, "bad_request", "The upload was interrupted before the whole file arrived; nothing was stored.");
  }
  await sequelize.query("UPDATE uploads SET status = 'queued', byte_count = :total, updated_at = now() WHERE id = :id", { replacements: { id, total } });
  if (options.queue !== false) await enqueue(QUEUES.ingest, { uploadId: id });
  return id;
}

export interface JobView {
  id: string;
  kind: "ingest";
  status: string;
  fileName: string;
  byteCount: number;
  rowsRead: number;
  rowsStored: number;
  datasetId: number | null;
  report: Record<string, unknown> | null;
  createdAt: string;
  updatedAt: string;
}

/** An upload job's progress and outcome, for its owner (or any data role). */
export async function getJob(id: string): Promise<JobView | null> {
  if (!/^[0-9a-f-]{36}$/i.test(id)) return null;
  const rows = await getDb().sequelize.query<Record<string, unknown>>(
    "SELECT id, status, file_name, byte_count, rows_read, rows_stored, dataset_id, report, created_at, updated_at, user_id FROM uploads WHERE id = :id",
    { replacements: { id }, type: QueryTypes.SELECT },
  );
  const r = rows[0];
  if (!r) return null;
  return {
    id: String(r.id),
    kind: "ingest",
    status: String(r.status),
    fileName: String(r.file_name),
    byteCount: Number(r.byte_count),
    rowsRead: Number(r.rows_read),
    rowsStored: Number(r.rows_stored),
    datasetId: r.dataset_id == null ? null : Number(r.dataset_id),
    report: (r.report as Record<string, unknown>) ?? null,
    createdAt: new Date(r.created_at as string).toISOString(),
    updatedAt: new Date(r.updated_at as string).toISOString(),
  };
}

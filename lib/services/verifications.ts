import "server-only";
import { QueryTypes } from "sequelize";
import { getDb } from "@/lib/db";
import { HttpError, notFound } from "@/lib/http";
import { enqueue, QUEUES } from "@/lib/jobs/queue";
import { receiveUpload } from "./uploads";
import type { PublicUser } from "./users";

/** Step 1: the bundle (JSON). Returns the verification id. */
export async function createVerification(user: PublicUser, bundle: unknown): Promise<number> {
  const b = bundle as { format?: unknown; settings?: unknown; dataset?: { contentHash?: unknown }; site?: unknown; headline?: unknown };
  if (b?.format !== "siderea-reproduction-bundle" || !b.settings || !b.dataset?.contentHash || !b.site || !b.headline) {
    throw new HttpError(422, "validation_failed", "This is not a Siderea reproduction bundle (format, settings, dataset, site and headline are needed).", [{ path: "bundle", message: "Not a reproduction bundle." }]);
  }
  const [row] = await getDb().sequelize.query<{ id: number }>("INSERT INTO verifications (user_id, bundle, status, created_at) VALUES (:u, :b, 'awaiting-events', now()) RETURNING id", {
    replacements: { u: user.id, b: JSON.stringify(bundle) },
    type: QueryTypes.SELECT,
  });
  return row!.id;
}

/** Step 2: the events CSV as the request body; queues the check. */
export async function attachVerificationEvents(user: PublicUser, id: number, body: ReadableStream<Uint8Array> | null): Promise<void> {
  const v = await getVerification(user, id);
  if (v.status !== "awaiting-events") throw new HttpError(409, "conflict", "This verification already has its events.");
  const uploadId = await receiveUpload(body, { userId: user.id, datasetId: null, fileName: "verification-events.csv", options: { mode: "verify" } }, { queue: false });
  await getDb().sequelize.query("UPDATE verifications SET upload_id = :u, status = 'queued' WHERE id = :id", { replacements: { u: uploadId, id } });
  await enqueue(QUEUES.verification, { verificationId: id });
}

export async function getVerification(user: PublicUser, id: number) {
  const [row] = await getDb().sequelize.query<{ id: number; user_id: number; status: string; result: unknown; error: string | null; bundle: { analysis?: unknown } }>(
    "SELECT id, user_id, status, result, error, bundle FROM verifications WHERE id = :id",
    { replacements: { id }, type: QueryTypes.SELECT },
  );
  if (!row) throw notFound("verification");
  if (row.user_id !== user.id) throw new HttpError(403, "forbidden", "This verification belongs to someone else.");
  return { id: row.id, status: row.status, result: row.result, error: row.error, analysis: row.bundle.analysis ?? null };
}

import "server-only";
import { Op, QueryTypes, type WhereOptions } from "sequelize";
import { acquireRawClient, getDb } from "@/lib/db";
import { copyOutRows } from "./copy-out";
import { HttpError, notFound } from "@/lib/http";
import { blindOffsetDeg, blindTimeShiftMs } from "@/lib/datasets/blinding";
import { copyUnescape } from "@/lib/datasets/copy-text";
import { equatorialToGalactic } from "@/lib/sky/coordinates";
import type { Dataset } from "@/models/dataset";
import type { DatasetListQuery } from "@/lib/validations/dataset";
import type { DatasetSummary } from "./dataset-summary";
import { audit } from "./audit";

export interface DatasetRow {
  id: number;
  name: string;
  siteId: number;
  siteName: string;
  status: string;
  version: number;
  eventCount: number;
  timeStart: string | null;
  timeEnd: string | null;
  blinded: boolean;
  createdAt: string;
}

function row(d: Dataset & { site?: { name: string } }): DatasetRow {
  return {
    id: d.id,
    name: d.name,
    siteId: d.siteId,
    siteName: d.site?.name ?? "",
    status: d.status,
    version: d.version,
    eventCount: Number(d.eventCount),
    timeStart: d.timeStart?.toISOString() ?? null,
    timeEnd: d.timeEnd?.toISOString() ?? null,
    blinded: d.blinded && !d.unblindedAt,
    createdAt: d.createdAt.toISOString(),
  };
}

/** Datasets for the table: filtered by name and site, sorted and paginated in PostgreSQL. */
export async function listDatasets(q: DatasetListQuery): Promise<{ rows: DatasetRow[]; total: number; page: number; pageSize: number }> {
  const { Dataset, Site } = getDb().models;
  const where: WhereOptions = {};
  if (q.q) Object.assign(where, { name: { [Op.iLike]: `%${q.q.replace(/[\\%_]/g, (c) => `\\${c}`)}%` } });
  if (q.siteId) Object.assign(where, { siteId: q.siteId });
  const { rows, count } = await Dataset.findAndCountAll({
    where,
    attributes: ["id", "name", "siteId", "status", "version", "eventCount", "timeStart", "timeEnd", "blinded", "unblindedAt", "createdAt"],
    include: [{ model: Site, as: "site", attributes: ["name"] }],
    order: [[q.sort, q.dir.toUpperCase()], ["id", "DESC"]],
    limit: q.pageSize,
    offset: (q.page - 1) * q.pageSize,
  });
  return { rows: rows.map((d) => row(d as Dataset & { site?: { name: string } })), total: count, page: q.page, pageSize: q.pageSize };
}

export interface DatasetDetail extends DatasetRow {
  description: string;
  contentHash: string | null;
  droppedRows: number;
  mapping: Record<string, unknown>;
  summary: DatasetSummary | null;
  site: { id: number; name: string; latitudeDeg: number; longitudeDeg: number; heightM: number; zenithMaxDeg: number };
  versions: { version: number; contentHash: string; eventCount: number; batchEventCount: number; droppedRows: number; createdAt: string }[];
  analyses: { id: number; name: string; kind: string; datasetVersion: number; status: string }[];
  unblindedAt: string | null;
}

export async function getDatasetDetail(id: number): Promise<DatasetDetail> {
  const { Dataset, Site, Analysis } = getDb().models;
  const d = await Dataset.findByPk(id, { include: [{ model: Site, as: "site" }] });
  if (!d) throw notFound("dataset");
  const site = (d as Dataset & { site: InstanceType<typeof Site> }).site;
  const versions = await getDb().sequelize.query<Record<string, unknown>>(
    "SELECT version, content_hash, event_count, batch_event_count, dropped_rows, created_at FROM dataset_versions WHERE dataset_id = :id ORDER BY version",
    { replacements: { id }, type: QueryTypes.SELECT },
  );
  const analyses = await Analysis.findAll({ where: { datasetId: id }, attributes: ["id", "name", "kind", "datasetVersion", "status"], order: [["id", "DESC"]] });
  return {
    ...row(d as Dataset & { site?: { name: string } }),
    description: d.description,
    contentHash: d.contentHash,
    droppedRows: d.droppedRows,
    mapping: d.mapping,
    summary: (d.summary as unknown as DatasetSummary) ?? null,
    site: { id: site.id, name: site.name, latitudeDeg: site.latitudeDeg, longitudeDeg: site.longitudeDeg, heightM: site.heightM, zenithMaxDeg: site.zenithMaxDeg },
    versions: versions.map((v) => ({
      version: Number(v.version),
      contentHash: String(v.content_hash),
      eventCount: Number(v.event_count),
      batchEventCount: Number(v.batch_event_count),
      droppedRows: Number(v.dropped_rows),
      createdAt: new Date(v.created_at as string).toISOString(),
    })),
    analyses: analyses.map((a) => ({ id: a.id, name: a.name, kind: a.kind, datasetVersion: a.datasetVersion, status: a.status })),
    unblindedAt: d.unblindedAt?.toISOString() ?? null,
  };
}

export const EVENTS_CSV_HEADER = "id,time,zenith,azimuth,energy,ra,dec,l,b\n";

/**
 * Streams the converted event table as CSV (`id,time,zenith,azimuth,energy,ra,dec,l,b`: ISO
 * 8601 UTC, degrees, EeV, azimuth north-clockwise), up to a version. While the dataset is
 * blinded, RA is shifted by the secret offset, l and b are recomputed from the shifted
 * direction, and times move by the same fraction of a sidereal day (lib/datasets/blinding.ts).
 */
export async function streamEventsCsv(id: number, version?: number): Promise<{ stream: ReadableStream<Uint8Array>; fileName: string; blinded: boolean }> {
  const d = await getDb().models.Dataset.findByPk(id, { attributes: ["id", "name", "version", "blinded", "blindSeed", "unblindedAt"] });
  if (!d) throw notFound("dataset");
  const upTo = version ?? d.version;
  if (upTo < 1 || upTo > d.version) throw new HttpError(422, "validation_failed", `Version ${upTo} does not exist; the dataset has versions 1 to ${d.version}.`, [{ path: "version", message: "No such version." }]);
  const blinded = d.blinded && !d.unblindedAt;
  const offsetDeg = blinded ? blindOffsetDeg(Number(d.blindSeed)) : 0;
  const shiftMs = blinded ? blindTimeShiftMs(offsetDeg) : 0;
  const { client, release } = await acquireRawClient();
  const rows = copyOutRows(client, `SELECT event_id, unix_ms, zenith_deg, azimuth_deg, energy_eev, ra_deg, dec_deg, l_deg, b_deg FROM events
                  WHERE dataset_id = ${Number(id)} AND version <= ${Number(upTo)} ORDER BY seq`);
  const encoder = new TextEncoder();
  const fmt = (x: number) => (Math.round(x * 1e6) / 1e6).toString();
  const convert = (f: string[][]): string => {
    const n = f.length;
    const ra = new Float64Array(n), dec = new Float64Array(n);
    for (let i = 0; i < n; i++) {
      ra[i] = (((Number(f[i]![5]) + offsetDeg) % 360) + 360) % 360;
      dec[i] = Number(f[i]![6]);
    }
    const gal = blinded ? equatorialToGalactic(ra, dec) : null;
    let out = "";
    for (let i = 0; i < n; i++) {
      const r = f[i]!;
      const idText = copyUnescape(r[0]!);
      const id = /[",\n\r]/.test(idText) ? `"${idText.replace(/"/g, '""')}"` : idText;
      const t = new Date(Number(r[1]) + shiftMs).toISOString();
      const e = r[4] === "\\N" ? "" : r[4];
      const l = gal ? gal.lDeg[i]! : Number(r[7]);
      const b = gal ? gal.bDeg[i]! : Number(r[8]);
      out += `${id},${t},${r[2]},${r[3]},${e},${fmt(ra[i]!)},${fmt(dec[i]!)},${fmt(l)},${fmt(b)}\n`;
    }
    return out;
  };
  const stream = new ReadableStream<Uint8Array>({
    start(controller) {
      controller.enqueue(encoder.encode(EVENTS_CSV_HEADER));
    },
    async pull(controller) {
      try {
        const { done, value } = await rows.next();
        if (done) {
          await release();
          controller.close();
          return;
        }
        controller.enqueue(encoder.encode(convert(value)));
      } catch (error) {
        await release();
        controller.error(error);
      }
    },
    async cancel() {
      await rows.return(undefined);
      await release();
    },
  });
  const safeName = d.name.replace(/[^A-Za-z0-9._-]+/g, "-").slice(0, 80) || "dataset";
  return { stream, fileName: `${safeName}-v${upTo}${blinded ? "-blinded" : ""}.csv`, blinded };
}

/** Lifts the blinding of a dataset (analyst); written to the audit log. */
export async function unblindDataset(id: number, actorId: number, reason: string): Promise<void> {
  const d = await getDb().models.Dataset.findByPk(id);
  if (!d) throw notFound("dataset");
  if (!d.blinded || d.unblindedAt) throw new HttpError(409, "conflict", "This dataset is not blinded.");
  d.unblindedAt = new Date();
  await d.save();
  await audit({ actorId, action: "dataset.unblind", targetType: "dataset", targetId: id, details: { reason } });
}

import "server-only";
import { QueryTypes } from "sequelize";
import { getDb } from "@/lib/db";
import { compareSummaries } from "@/lib/analyses/canonical";
import { computeHotspot, computeLargeScale, type ComputeResult, type MapLayer } from "@/lib/analyses/compute";
import { codeVersion } from "@/lib/version";
import { AnalysisSettingsSchema, type AnalysisSettings } from "@/lib/validations/analysis";
import { headline, MAP_UNITS } from "./analyses";
import { loadDatasetEvents } from "./event-arrays";
import { checkBundle } from "@/lib/analyses/verify-bundle";
import { discardUploadBytes, parseStoredUpload } from "./ingest";

// The analysis and reproduction jobs. Imported by the worker process only: the computations
// start worker threads, which the web server's bundle does not carry.

/** Runs the computation of a settings object on its dataset version, checking the data's hash. */
export async function computeForSettings(settings: AnalysisSettings, expectedHash: string, opts: Parameters<typeof computeHotspot>[3] = {}): Promise<ComputeResult & { blinded: boolean }> {
  const loaded = await loadDatasetEvents(settings.datasetId, settings.datasetVersion);
  if (loaded.contentHash !== expectedHash) {
    throw new Error(`the stored events of dataset ${settings.datasetId} version ${settings.datasetVersion} no longer match their hash (${loaded.contentHash} != ${expectedHash})`);
  }
  const result = settings.kind === "hotspot" ? await computeHotspot(loaded.events, loaded.site, settings, opts) : await computeLargeScale(loaded.events, loaded.site, settings, opts);
  return { ...result, summary: { ...result.summary, blinded: loaded.blinded, datasetHash: loaded.contentHash }, blinded: loaded.blinded };
}

/** The analysis job: computes, stores summary and maps; cancellable between progress steps. */
export async function runAnalysisJob(analysisId: number): Promise<void> {
  const { models, sequelize } = getDb();
  const analysis = await models.Analysis.findByPk(analysisId);
  if (!analysis || analysis.status === "done" || analysis.status === "cancelled") return;
  const started = new Date();
  await analysis.update({ status: "running", startedAt: started, progress: 0, error: null });
  const controller = new AbortController();
  let lastWrite = 0;
  const poll = setInterval(async () => {
    const [row] = await sequelize.query<{ status: string }>("SELECT status FROM analyses WHERE id = :id", { replacements: { id: analysisId }, type: QueryTypes.SELECT });
    if (row?.status === "cancelled") controller.abort();
  }, 1000);
  try {
    const settings = AnalysisSettingsSchema.parse(analysis.settings);
    const result = await computeForSettings(settings, analysis.datasetHash, {
      signal: controller.signal,
      onProgress: (fraction) => {
        const now = Date.now();
        if (now - lastWrite > 500) {
          lastWrite = now;
          void sequelize.query("UPDATE analyses SET progress = :p WHERE id = :id AND status = 'running'", { replacements: { p: fraction, id: analysisId } });
        }
      },
    });
    await sequelize.transaction(async (t) => {
      await sequelize.query("DELETE FROM analysis_maps WHERE analysis_id = :id", { replacements: { id: analysisId }, transaction: t });
      for (const [layer, values] of Object.entries(result.maps) as [MapLayer, Float32Array][]) {
        await sequelize.query("INSERT INTO analysis_maps (analysis_id, layer, nside, ordering, coordsys, unit, data) VALUES ($1, $2, $3, 'RING', 'C', $4, $5)", {
          bind: [analysisId, layer, result.nside, MAP_UNITS[layer], Buffer.from(values.buffer, values.byteOffset, values.byteLength)],
          transaction: t,
        });
      }
      const finished = new Date();
      await sequelize.query(
        "UPDATE analyses SET status = 'done', progress = 1, summary = :summary, finished_at = :finished, updated_at = now() WHERE id = :id AND status = 'running'",
        { replacements: { id: analysisId, summary: JSON.stringify({ ...result.summary, timings: { seconds: (finished.getTime() - started.getTime()) / 1000 } }), finished }, transaction: t },
      );
    });
  } catch (error) {
    if ((error as Error).name === "AbortError" || controller.signal.aborted) {
      await sequelize.query("UPDATE analyses SET status = 'cancelled', finished_at = now() WHERE id = :id", { replacements: { id: analysisId } });
      return;
    }
    await sequelize.query("UPDATE analyses SET status = 'failed', error = :error, finished_at = now() WHERE id = :id", {
      replacements: { id: analysisId, error: (error as Error).message.slice(0, 2000) },
    });
    throw error;
  } finally {
    clearInterval(poll);
  }
}

export async function runReproductionJob(reproductionId: number): Promise<void> {
  const { sequelize, models } = getDb();
  const [r] = await sequelize.query<{ analysis_id: number; status: string }>("SELECT analysis_id, status FROM analysis_reproductions WHERE id = :id", {
    replacements: { id: reproductionId },
    type: QueryTypes.SELECT,
  });
  if (!r || r.status === "done") return;
  await sequelize.query("UPDATE analysis_reproductions SET status = 'running' WHERE id = :id", { replacements: { id: reproductionId } });
  try {
    const a = await models.Analysis.findByPk(r.analysis_id);
    if (!a) throw new Error("the analysis no longer exists");
    const settings = AnalysisSettingsSchema.parse(a.settings);
    const result = await computeForSettings(settings, a.datasetHash);
    // Compared as stored: through JSON, as the saved summary was.
    const differences = compareSummaries(headline(a.summary), headline(JSON.parse(JSON.stringify(result.summary))));
    await sequelize.query(
      "UPDATE analysis_reproductions SET status = 'done', summary = :summary, comparison = :comparison, code_version = :code, finished_at = now() WHERE id = :id",
      {
        replacements: {
          id: reproductionId,
          summary: JSON.stringify(result.summary),
          comparison: JSON.stringify({ match: differences.length === 0, tolerance: "identical strings; numbers within 1e-9 relative", differences: differences.slice(0, 50) }),
          code: codeVersion(),
        },
      },
    );
  } catch (error) {
    await sequelize.query("UPDATE analysis_reproductions SET status = 'failed', error = :e, finished_at = now() WHERE id = :id", {
      replacements: { id: reproductionId, e: (error as Error).message.slice(0, 2000) },
    });
    throw error;
  }
}


/** Checks an uploaded bundle against its uploaded events CSV (the web form's job). */
export async function runVerificationJob(verificationId: number): Promise<void> {
  const { sequelize } = getDb();
  const [v] = await sequelize.query<{ upload_id: string | null; bundle: unknown; status: string }>("SELECT upload_id, bundle, status FROM verifications WHERE id = :id", {
    replacements: { id: verificationId },
    type: QueryTypes.SELECT,
  });
  if (!v || !v.upload_id || v.status === "done") return;
  await sequelize.query("UPDATE verifications SET status = 'running' WHERE id = :id", { replacements: { id: verificationId } });
  try {
    const parsed = await parseStoredUpload(v.upload_id, { timeFormat: "iso", azimuthConvention: "north-clockwise", energyUnit: "EeV", columns: {} });
    if (!parsed.ok) {
      const reason = "fatal" in parsed ? parsed.fatal : parsed.headerError ?? `${parsed.badRowCount} bad rows, first at line ${parsed.badRows[0]?.line}: ${parsed.badRows[0]?.reason}`;
      throw new Error(`the events file cannot be read: ${reason}`);
    }
    const t = parsed.table;
    const result = await checkBundle(v.bundle, { n: t.n, ids: t.ids, unixMs: t.unixMs, zenithDeg: t.zenithDeg, azimuthDeg: t.azimuthDeg, energyEeV: t.energyEeV });
    await sequelize.query("UPDATE verifications SET status = 'done', result = :r, finished_at = now() WHERE id = :id", { replacements: { r: JSON.stringify(result), id: verificationId } });
  } catch (error) {
    await sequelize.query("UPDATE verifications SET status = 'failed', error = :e, finished_at = now() WHERE id = :id", {
      replacements: { e: (error as Error).message.slice(0, 2000), id: verificationId },
    });
  } finally {
    await discardUploadBytes(v.upload_id);
  }
}

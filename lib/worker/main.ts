/**
 * The job worker: takes queued jobs from PostgreSQL (pg-boss) and runs them. Start as many as
 * you like, on any machine that reaches the database: `npm run worker`.
 * Runs under the react-server export condition so that "server-only" modules load.
 */
import { getBoss, QUEUES, stopBoss } from "@/lib/jobs/queue";
import { closeDb } from "@/lib/db";
import { failIngest, recoverStaleIngests, runIngest } from "@/lib/services/ingest";
import { readEnv } from "@/lib/env";
import { runAnalysisJob, runReproductionJob, runVerificationJob } from "@/lib/services/analysis-jobs";
import { scheduleWatchedReruns } from "@/lib/services/alerts";
import { runWatchRun, sweepWatchedAnalyses } from "@/lib/services/alerts-jobs";
import { deliverMail, queueDailyDigests, sweepPendingMail } from "@/lib/services/mail";

interface IngestJob {
  uploadId: string;
}

async function main(): Promise<void> {
  const boss = await getBoss();
  await boss.work<IngestJob>(QUEUES.ingest, { pollingIntervalSeconds: 1, batchSize: 1, includeMetadata: true }, async ([job]) => {
    if (!job) return;
    const started = Date.now();
    try {
      const outcome = await runIngest(job.data.uploadId);
      console.log(`ingest ${job.data.uploadId}: ${outcome.status} in ${((Date.now() - started) / 1000).toFixed(1)} s`);
    } catch (error) {
      console.error(`ingest ${job.data.uploadId} failed (attempt ${job.retryCount + 1}): ${(error as Error).message}`);
      if (job.retryCount >= job.retryLimit) await failIngest(job.data.uploadId, "Storing the events failed on the server; nothing was stored. The error was logged.");
      throw error;
    }
  });
  // Analyses hold the CPU (trials use worker threads on both cores): one at a time per worker.
  await boss.work<{ analysisId: number }>(QUEUES.analysis, { pollingIntervalSeconds: 1, batchSize: 1 }, async ([job]) => {
    if (!job) return;
    const started = Date.now();
    await runAnalysisJob(job.data.analysisId);
    console.log(`analysis ${job.data.analysisId} finished in ${((Date.now() - started) / 1000).toFixed(1)} s`);
  });
  await boss.work<{ reproductionId: number }>(QUEUES.reproduction, { pollingIntervalSeconds: 1, batchSize: 1 }, async ([job]) => {
    if (!job) return;
    await runReproductionJob(job.data.reproductionId);
  });
  await boss.work<{ verificationId: number }>(QUEUES.verification, { pollingIntervalSeconds: 1, batchSize: 1 }, async ([job]) => {
    if (!job) return;
    await runVerificationJob(job.data.verificationId);
  });
  // Watched analyses: after an append, create their reruns; run each, then the alert rule.
  await boss.work<{ datasetId: number }>(QUEUES.watchSchedule, { pollingIntervalSeconds: 1, batchSize: 1 }, async ([job]) => {
    if (!job) return;
    const created = await scheduleWatchedReruns(job.data.datasetId);
    if (created.length) console.log(`dataset ${job.data.datasetId}: ${created.length} rerun(s) of watched analyses queued`);
  });
  await boss.work<{ watchRunId: number }>(QUEUES.watchRun, { pollingIntervalSeconds: 1, batchSize: 1 }, async ([job]) => {
    if (!job) return;
    const outcome = await runWatchRun(job.data.watchRunId);
    console.log(`watched rerun ${job.data.watchRunId}: ${outcome.alerts} alert(s), ${outcome.deliveries} delivery(ies)`);
  });
  // E-mail: a failure throws, pg-boss retries with backoff; the delivery row keeps the state.
  await boss.work<{ deliveryIds: number[] }>(QUEUES.mail, { pollingIntervalSeconds: 1, batchSize: 1, includeMetadata: true }, async ([job]) => {
    if (!job) return;
    try {
      const outcome = await deliverMail(job.data.deliveryIds);
      if (outcome === "sent") console.log(`mail for deliveries ${job.data.deliveryIds.join(", ")} sent`);
    } catch (error) {
      console.error(`mail for deliveries ${job.data.deliveryIds.join(", ")} not sent (attempt ${job.retryCount + 1}, retried with backoff): ${(error as Error).message}`);
      throw error;
    }
  });
  await boss.work(QUEUES.digest, { pollingIntervalSeconds: 5, batchSize: 1 }, async () => {
    const n = await queueDailyDigests();
    console.log(`daily digest: ${n} subscriber(s)`);
  });
  await boss.schedule(QUEUES.digest, readEnv().SIDEREA_DIGEST_CRON, {}, { tz: "UTC" });
  const alertSweep = async () => {
    try {
      await sweepWatchedAnalyses();
      await sweepPendingMail();
    } catch (error) {
      console.error(`sweep of watched analyses and mail failed: ${(error as Error).message}`);
    }
  };
  void alertSweep();
  const alertSweeper = setInterval(() => void alertSweep(), 60_000);
  alertSweeper.unref();
  // Uploads whose worker died mid-job: taken again at start and every minute (the advisory
  // lock in runIngest keeps two workers off the same upload).
  const stale = readEnv().SIDEREA_JOB_STALE_SECONDS;
  const sweep = async () => {
    try {
      const taken = await recoverStaleIngests(stale);
      if (taken.length) console.log(`recovered ${taken.length} interrupted upload(s): ${taken.join(", ")}`);
    } catch (error) {
      console.error(`sweep for interrupted uploads failed: ${(error as Error).message}`);
    }
  };
  void sweep();
  const sweeper = setInterval(() => void sweep(), 60_000);
  sweeper.unref();
  console.log("siderea worker: waiting for jobs");
  const stop = async () => {
    await stopBoss();
    await closeDb();
    process.exit(0);
  };
  process.on("SIGTERM", stop);
  process.on("SIGINT", stop);
}

main().catch((error) => {
  console.error(`siderea worker could not start: ${(error as Error).message}`);
  process.exit(1);
});

/**
 * The figures of a stored alert (a row of the alerts table), as the alerts page and the
 * e-mails show them: position in both frames, counts, and local beside post-trial
 * significance with the trials counted.
 */
export interface AlertFigures {
  id: number;
  kind: "new" | "update";
  watchedAnalysisId: number;
  runAnalysisId: number;
  datasetVersion: number;
  /** ICRS and galactic, degrees. */
  raDeg: number;
  decDeg: number;
  lDeg: number;
  bDeg: number;
  radiusDeg: number;
  nOn: number;
  nExpected: number;
  localSigma: number;
  postTrialP: number;
  postTrialPUpperBound: number | null;
  postTrialSigma: number | null;
  postTrialSigmaLowerBound: number | null;
  nSkies: number;
  trialsCounted: string;
  previousLocalSigma: number | null;
  previousAnnouncedSigma: number | null;
}

/** The figures of an alerts row as PostgreSQL returns it (snake_case columns). */
export function alertFiguresFromRow(r: Record<string, unknown>): AlertFigures {
  return {
    id: r.id as number, kind: r.kind as "new" | "update", watchedAnalysisId: r.watched_analysis_id as number,
    runAnalysisId: r.run_analysis_id as number, datasetVersion: r.dataset_version as number,
    raDeg: r.ra_deg as number, decDeg: r.dec_deg as number, lDeg: r.l_deg as number, bDeg: r.b_deg as number, radiusDeg: r.radius_deg as number,
    nOn: r.n_on as number, nExpected: r.n_expected as number, localSigma: r.local_sigma as number,
    postTrialP: r.post_trial_p as number, postTrialPUpperBound: r.post_trial_p_upper_bound as number | null, postTrialSigma: r.post_trial_sigma as number | null,
    postTrialSigmaLowerBound: r.post_trial_sigma_lower_bound as number | null, nSkies: r.n_skies as number, trialsCounted: r.trials_counted as string,
    previousLocalSigma: r.previous_local_sigma as number | null, previousAnnouncedSigma: r.previous_announced_sigma as number | null,
  };
}

/**
 * The alert rule of watched analyses, pure (no framework, database or environment) so that it
 * is unit-tested on its own.
 *
 * A window of a rerun on new data raises a NEW alert when its local significance is at or
 * above the threshold (and, when one is set, its post-trial significance too) and no alert of
 * the same watched analysis lies within the deduplication distance (default: the window
 * radius). A window near an existing alert raises an UPDATE of that alert, not a new one,
 * when its local significance is at least the alert's last announced level plus the step
 * (default 1 sigma); otherwise nothing. Windows are taken strongest first, so of two nearby
 * windows in one run the stronger is announced and the other counts as the same cluster.
 * A window that is not the peak of its neighbourhood (some window centre within the
 * deduplication distance is more significant: it sits on the flank of a stronger excess) raises
 * nothing of its own: a broad cluster is announced once, at its peak.
 */
import { angularDistanceDeg } from "./angles";

/** Default thresholds of the issue: 4 sigma local, no post-trial threshold, 1 sigma update step. */
export const DEFAULT_LOCAL_SIGMA_THRESHOLD = 4;
export const DEFAULT_UPDATE_STEP_SIGMA = 1;

/** One window of a rerun's summary (the scan's top windows), ICRS and galactic positions in degrees. */
export interface RuleWindow {
  raDeg: number;
  decDeg: number;
  lDeg: number;
  bDeg: number;
  nOn: number;
  nExpected: number;
  localSignificance: number;
  /** Post-trial sigma; when no isotropic sky reached the window, the lower bound; null if unknown. */
  postTrialSigma: number | null;
  /** False when a more significant window lies within the deduplication distance (default true). */
  peak?: boolean;
}

/** An alert already raised for the watched analysis, at the level last announced (new or update). */
export interface KnownAlert {
  id: number;
  raDeg: number;
  decDeg: number;
  announcedLocalSigma: number;
}

export interface RuleOptions {
  localSigmaThreshold: number;
  postTrialSigmaThreshold: number | null;
  dedupRadiusDeg: number;
  updateStepSigma: number;
}

export type Decision =
  | { kind: "new"; window: RuleWindow }
  | { kind: "update"; window: RuleWindow; alertId: number; previousAnnouncedSigma: number; distanceDeg: number };

/** Whether a window's figures meet a local threshold and an optional post-trial threshold. */
export function meetsThresholds(w: Pick<RuleWindow, "localSignificance" | "postTrialSigma">, localSigma: number, postTrialSigma: number | null): boolean {
  if (!(w.localSignificance >= localSigma)) return false;
  if (postTrialSigma !== null && !(w.postTrialSigma !== null && w.postTrialSigma >= postTrialSigma)) return false;
  return true;
}

/** The decisions of one rerun: new alerts and updates, strongest window first. */
export function decideAlerts(windows: readonly RuleWindow[], known: readonly KnownAlert[], options: RuleOptions): Decision[] {
  if (!(options.dedupRadiusDeg >= 0)) throw new RangeError("the deduplication distance is a non-negative angle in degrees");
  if (!(options.updateStepSigma > 0)) throw new RangeError("the update step is a positive number of sigma");
  // Working copy: alerts raised or updated earlier in this run count for the windows after them.
  const alerts: { id: number; raDeg: number; decDeg: number; level: number }[] = known.map((a) => ({ id: a.id, raDeg: a.raDeg, decDeg: a.decDeg, level: a.announcedLocalSigma }));
  const decisions: Decision[] = [];
  const sorted = [...windows].sort((a, b) => b.localSignificance - a.localSignificance);
  for (const w of sorted) {
    if (w.peak === false) continue;
    if (!meetsThresholds(w, options.localSigmaThreshold, options.postTrialSigmaThreshold)) continue;
    let nearest: (typeof alerts)[number] | null = null;
    let nearestDeg = Infinity;
    for (const a of alerts) {
      const d = angularDistanceDeg(w.raDeg, w.decDeg, a.raDeg, a.decDeg);
      if (d <= options.dedupRadiusDeg && d < nearestDeg) {
        nearest = a;
        nearestDeg = d;
      }
    }
    if (!nearest) {
      decisions.push({ kind: "new", window: w });
      alerts.push({ id: -decisions.length, raDeg: w.raDeg, decDeg: w.decDeg, level: w.localSignificance });
    } else if (w.localSignificance >= nearest.level + options.updateStepSigma) {
      // An update of a new alert of this same run cannot happen: that alert is the stronger window.
      decisions.push({ kind: "update", window: w, alertId: nearest.id, previousAnnouncedSigma: nearest.level, distanceDeg: nearestDeg });
      nearest.level = w.localSignificance;
    }
  }
  return decisions;
}

/** The strongest window of a previous run within `radiusDeg` of a position, for the comparison shown with an alert. */
export function previousWindowNear<T extends Pick<RuleWindow, "raDeg" | "decDeg" | "localSignificance">>(previous: readonly T[], raDeg: number, decDeg: number, radiusDeg: number): T | null {
  let best: T | null = null;
  for (const w of previous) {
    if (angularDistanceDeg(raDeg, decDeg, w.raDeg, w.decDeg) <= radiusDeg && (!best || w.localSignificance > best.localSignificance)) best = w;
  }
  return best;
}

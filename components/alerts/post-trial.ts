/** Post-trial text shared by the alerts table and the watch panel (same wording as the e-mails). */
export function postTrialLabel(a: { postTrialP: number; postTrialPUpperBound: number | null; postTrialSigma: number | null; postTrialSigmaLowerBound: number | null; nSkies: number }): string {
  if (a.postTrialPUpperBound !== null) return `p < ${a.postTrialPUpperBound} (none of ${a.nSkies} skies; above ${a.postTrialSigmaLowerBound?.toFixed(2) ?? "?"}σ)`;
  return `p = ${a.postTrialP} (${Math.round(a.postTrialP * a.nSkies)} of ${a.nSkies} skies${a.postTrialSigma !== null ? `; ${a.postTrialSigma.toFixed(2)}σ` : ""})`;
}

export const fmtDeg = (v: number, digits = 2) => `${v.toFixed(digits)}°`;
export const fmtSigned = (v: number, digits = 2) => `${v >= 0 ? "+" : "−"}${Math.abs(v).toFixed(digits)}°`;

/**
 * Significance of an excess of counts in an "on" region over a background estimated
 * from an "off" region, following Li & Ma 1983 (ApJ 272, 317).
 *
 * Notation: nOn counts in the window, nOff counts outside it, alpha = ratio of
 * on-exposure to off-exposure (alpha = f / (1 - f) for a window holding the fraction f of
 * the total exposure), so the expected on-count under the null hypothesis is alpha * nOff.
 * Counts may be non-integer (e.g. a scrambled expectation divided by the number of
 * scramblings); they must be >= 0.
 */

/**
 * Li & Ma 1983, eq. 17 (likelihood-ratio significance), SIGNED: negative when
 * nOn < alpha * nOff (a deficit), positive for an excess, 0 when nOn = alpha * nOff.
 * Terms with a zero count vanish (x ln x -> 0). Dimensionless, in Gaussian sigma.
 * Returns +Infinity for nOn > 0 with alpha = 0 (events where no exposure is expected),
 * NaN for negative or non-finite inputs.
 */
export function liMaSignificance(nOn: number, nOff: number, alpha: number): number {
  if (!(nOn >= 0 && nOff >= 0 && alpha >= 0) || !Number.isFinite(nOn + nOff) || Number.isNaN(alpha)) return NaN;
  const total = nOn + nOff;
  if (total === 0) return 0;
  if (alpha === 0) return nOn > 0 ? Infinity : 0;
  if (alpha === Infinity) return nOff > 0 ? -Infinity : 0;
  let sum = 0;
  if (nOn > 0) sum += nOn * Math.log(((1 + alpha) / alpha) * (nOn / total));
  if (nOff > 0) sum += nOff * Math.log((1 + alpha) * (nOff / total));
  // sum >= 0 mathematically (Gibbs' inequality); round-off can make it -1e-15.
  const s = Math.sqrt(2 * Math.max(0, sum));
  return nOn < alpha * nOff ? -s : s;
}

/**
 * Signed Li & Ma eq. 17 significance of a window from its on-count, the total count
 * nTotal and the window's share f of the total exposure, 0 <= f <= 1:
 * alpha = f / (1 - f), nOff = nTotal - nOn, expected count nExpected = f * nTotal (METHODS 5).
 */
export function liMaSignificanceFromFraction(nOn: number, nTotal: number, f: number): number {
  if (f >= 1) return nTotal - nOn > 0 ? -Infinity : 0;
  return liMaSignificance(nOn, nTotal - nOn, f / (1 - f));
}

/**
 * Li & Ma 1983, eq. 5: S = (nOn - alpha nOff) / sqrt(nOn + alpha^2 nOff), the naive
 * estimate using the variance of the observed difference. For reference and tests only.
 */
export function liMaEq5(nOn: number, nOff: number, alpha: number): number {
  return (nOn - alpha * nOff) / Math.sqrt(nOn + alpha * alpha * nOff);
}

/**
 * Li & Ma 1983, eq. 9: S = (nOn - alpha nOff) / sqrt(alpha (nOn + nOff)), the difference
 * divided by its standard deviation under the null hypothesis. Eq. 17 tends to it as the
 * counts grow. For reference and tests only.
 */
export function liMaEq9(nOn: number, nOff: number, alpha: number): number {
  return (nOn - alpha * nOff) / Math.sqrt(alpha * (nOn + nOff));
}

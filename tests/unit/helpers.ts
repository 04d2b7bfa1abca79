import { expect } from "vitest";

/** Asserts |actual - expected| <= tol, with a message that shows both numbers and the tolerance. */
export function expectClose(actual: number, expected: number, tol: number, what = "value"): void {
  const diff = Math.abs(actual - expected);
  if (!(diff <= tol)) {
    expect.fail(`${what}: expected ${expected} +- ${tol}, got ${actual} (off by ${diff})`);
  }
}

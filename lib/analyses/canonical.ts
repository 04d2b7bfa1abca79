import { createHash } from "node:crypto";

/** JSON with object keys sorted at every level and no whitespace: one text per value. */
export function canonicalJson(value: unknown): string {
  if (value === null || typeof value !== "object") {
    if (typeof value === "number" && !Number.isFinite(value)) throw new RangeError("canonical JSON has no NaN or Infinity");
    return JSON.stringify(value);
  }
  if (Array.isArray(value)) return `[${value.map(canonicalJson).join(",")}]`;
  const entries = Object.entries(value as Record<string, unknown>).filter(([, v]) => v !== undefined).sort(([a], [b]) => (a < b ? -1 : a > b ? 1 : 0));
  return `{${entries.map(([k, v]) => `${JSON.stringify(k)}:${canonicalJson(v)}`).join(",")}}`;
}

export function sha256Hex(text: string): string {
  return createHash("sha256").update(text).digest("hex");
}

/**
 * Compares the headline numbers of two runs: equal when every number agrees to `relTol`
 * (relative; absolute below 1e-12) and every other value is identical. Returns the differences.
 */
export function compareSummaries(saved: unknown, rerun: unknown, relTol = 1e-9, path = ""): { path: string; saved: unknown; rerun: unknown }[] {
  if (typeof saved === "number" && typeof rerun === "number") {
    const scale = Math.max(Math.abs(saved), Math.abs(rerun));
    return Math.abs(saved - rerun) <= Math.max(1e-12, relTol * scale) ? [] : [{ path, saved, rerun }];
  }
  if (saved && rerun && typeof saved === "object" && typeof rerun === "object") {
    const keys = new Set([...Object.keys(saved), ...Object.keys(rerun)]);
    return [...keys].flatMap((k) => compareSummaries((saved as Record<string, unknown>)[k], (rerun as Record<string, unknown>)[k], relTol, path ? `${path}.${k}` : k));
  }
  return saved === rerun ? [] : [{ path, saved, rerun }];
}

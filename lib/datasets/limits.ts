/** Upload limits, configurable by environment variables (read at call time). */
export function uploadLimits(env: Record<string, string | undefined> = process.env): { maxBytes: number; maxRows: number } {
  const maxBytes = Number(env.SIDEREA_UPLOAD_MAX_BYTES ?? 512 * 2 ** 20);
  const maxRows = Number(env.SIDEREA_UPLOAD_MAX_ROWS ?? 5_000_000);
  return {
    maxBytes: Number.isFinite(maxBytes) && maxBytes > 0 ? maxBytes : 512 * 2 ** 20,
    maxRows: Number.isFinite(maxRows) && maxRows > 0 ? maxRows : 5_000_000,
  };
}

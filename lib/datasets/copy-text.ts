/** Escapes a string for PostgreSQL's COPY text format (backslash, tab, newline, carriage return). */
export function copyEscape(s: string): string {
  return /[\\\t\n\r]/.test(s) ? s.replace(/\\/g, "\\\\").replace(/\t/g, "\\t").replace(/\n/g, "\\n").replace(/\r/g, "\\r") : s;
}

/** Inverse of copyEscape for a field read back with COPY ... TO STDOUT. */
export function copyUnescape(s: string): string {
  return s.indexOf("\\") === -1 ? s : s.replace(/\\(.)/g, (_, c: string) => (c === "t" ? "\t" : c === "n" ? "\n" : c === "r" ? "\r" : c));
}

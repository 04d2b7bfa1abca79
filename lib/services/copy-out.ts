import "server-only";
import type { PoolClient } from "pg";
import { to as copyTo } from "pg-copy-streams";

/**
 * Runs `COPY (query) TO STDOUT` (text format) and yields its rows in batches, one batch per
 * received chunk, each row split into its tab-separated fields (still COPY-escaped: see
 * lib/datasets/copy-text.ts; NULL is `\N`).
 */
export async function* copyOutRows(client: PoolClient, query: string): AsyncGenerator<string[][]> {
  const stream = client.query(copyTo(`COPY (${query}) TO STDOUT`));
  const decoder = new TextDecoder();
  let rest = "";
  for await (const chunk of stream as AsyncIterable<Buffer>) {
    const lines = (rest + decoder.decode(chunk, { stream: true })).split("\n");
    rest = lines.pop() ?? "";
    const rows = lines.filter((l) => l !== "").map((l) => l.split("\t"));
    if (rows.length) yield rows;
  }
  rest += decoder.decode();
  if (rest) yield [rest.split("\t")];
}

const BINARY_COPY_SIGNATURE = Buffer.from("PGCOPY\n\xff\r\n\0", "latin1");

/**
 * Runs `COPY (query) TO STDOUT WITH (FORMAT binary)` and returns the fields of its first row as
 * raw bytes (null for SQL NULL), or null when the query returns no row. Binary COPY sends a
 * bytea as it is stored, four times faster than a SELECT, whose bytea arrives hex-encoded and is
 * decoded in JavaScript (measured: 9.5 ms against 39 ms for a 3 MiB map). The layout is
 * PostgreSQL's documented binary COPY format: an 11-byte signature, 32-bit flags and header
 * extension length, then per row a 16-bit field count and per field a 32-bit length (-1 = NULL)
 * and the bytes, all big-endian; the file ends with a field count of -1.
 */
export async function copyOutFirstRowBinary(client: PoolClient, query: string): Promise<(Buffer | null)[] | null> {
  const stream = client.query(copyTo(`COPY (${query}) TO STDOUT WITH (FORMAT binary)`));
  const parts: Buffer[] = [];
  for await (const chunk of stream as AsyncIterable<Buffer>) parts.push(chunk);
  const all = parts.length === 1 ? parts[0]! : Buffer.concat(parts);
  if (all.length < 21 || !all.subarray(0, 11).equals(BINARY_COPY_SIGNATURE)) throw new Error("binary COPY: unexpected header");
  let at = 11 + 4;
  at += 4 + all.readUInt32BE(at);
  const fieldCount = all.readInt16BE(at);
  at += 2;
  if (fieldCount === -1) return null;
  const fields: (Buffer | null)[] = [];
  for (let f = 0; f < fieldCount; f++) {
    const length = all.readInt32BE(at);
    at += 4;
    if (length === -1) {
      fields.push(null);
      continue;
    }
    fields.push(all.subarray(at, at + length));
    at += length;
  }
  return fields;
}

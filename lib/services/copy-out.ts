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

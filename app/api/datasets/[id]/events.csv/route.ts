import { z } from "zod";
import { authorize } from "@/lib/auth/session";
import { parseOr422, route } from "@/lib/http";
import { streamEventsCsv } from "@/lib/services/datasets";

export const dynamic = "force-dynamic";

const ParamsSchema = z.object({ id: z.coerce.number().int().positive() });
const QuerySchema = z.object({ version: z.coerce.number().int().positive().optional() });

/** GET /api/datasets/:id/events.csv?version= : the converted event table, streamed (blinded while the dataset is). */
export const GET = route(async (request: Request, context: { params: Promise<{ id: string }> }) => {
  await authorize(request, "datasets:read");
  const { id } = parseOr422(ParamsSchema, await context.params, "dataset id");
  const { version } = parseOr422(QuerySchema, Object.fromEntries(new URL(request.url).searchParams), "query");
  const { stream, fileName, blinded } = await streamEventsCsv(id, version);
  return new Response(stream, {
    headers: {
      "content-type": "text/csv; charset=utf-8",
      "content-disposition": `attachment; filename="${fileName}"`,
      "x-siderea-blinded": String(blinded),
      "cache-control": "no-store",
    },
  });
});

import { NextResponse } from "next/server";
import { z } from "zod";
import { authorize } from "@/lib/auth/session";
import { parseOr422, readJson, route } from "@/lib/http";
import { unblindDataset } from "@/lib/services/datasets";

export const dynamic = "force-dynamic";

const ParamsSchema = z.object({ id: z.coerce.number().int().positive() });
const BodySchema = z.object({ reason: z.string().trim().min(3, "Say why the dataset is unblinded (it goes to the audit log).").max(2000) });

/** POST /api/datasets/:id/unblind { reason } : lift the blinding (analyst); audited. */
export const POST = route(async (request: Request, context: { params: Promise<{ id: string }> }) => {
  const user = await authorize(request, "datasets:unblind");
  const { id } = parseOr422(ParamsSchema, await context.params, "dataset id");
  const { reason } = parseOr422(BodySchema, await readJson(request), "unblinding");
  await unblindDataset(id, user.id, reason);
  return NextResponse.json({ ok: true });
});

import { NextResponse } from "next/server";
import { z } from "zod";
import { authorize } from "@/lib/auth/session";
import { parseOr422, readJson, route } from "@/lib/http";
import { changeRole } from "@/lib/services/users";
import { ChangeRoleSchema } from "@/lib/validations/user";

export const dynamic = "force-dynamic";

const ParamsSchema = z.object({ id: z.coerce.number().int().positive() });

/** PATCH /api/users/:id: change the role (admin). Body: { role }. */
export const PATCH = route(async (request: Request, context: { params: Promise<{ id: string }> }) => {
  // Session and role.
  const actor = await authorize(request, "users:manage");
  // Params and body.
  const { id } = parseOr422(ParamsSchema, await context.params, "user id");
  const { role } = parseOr422(ChangeRoleSchema, await readJson(request), "role change");
  // Work and response.
  return NextResponse.json({ user: await changeRole(id, role, actor.id) });
});

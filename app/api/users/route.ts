import { NextResponse } from "next/server";
import { authorize } from "@/lib/auth/session";
import { parseOr422, readJson, route } from "@/lib/http";
import { createUser, listUsers } from "@/lib/services/users";
import { CreateUserSchema } from "@/lib/validations/user";

export const dynamic = "force-dynamic";

/** GET /api/users: every user (admin). */
export const GET = route(async (request: Request) => {
  // Session and role.
  await authorize(request, "users:manage");
  // Work and response.
  return NextResponse.json({ users: await listUsers() });
});

/** POST /api/users: create a user (admin). Body: { email, name, role, password }. */
export const POST = route(async (request: Request) => {
  // Session and role.
  const actor = await authorize(request, "users:manage");
  // Body.
  const input = parseOr422(CreateUserSchema, await readJson(request), "user");
  // Work and response.
  const user = await createUser(input, actor.id);
  return NextResponse.json({ user }, { status: 201 });
});

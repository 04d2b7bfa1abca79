import { beforeAll, describe, expect, it } from "vitest";
import { useTestDatabase } from "./database";
import { makeUser, requestAs } from "./auth-helpers";
import { GET, POST } from "@/app/api/users/route";
import { PATCH } from "@/app/api/users/[id]/route";
import { getDb } from "@/lib/db";
import type { Role } from "@/lib/auth/roles";

useTestDatabase();

const ids = {} as Record<Role, number>;

beforeAll(async () => {
  for (const role of ["admin", "analyst", "referee", "member"] as const) ids[role] = (await makeUser(role)).id;
});

function post(userId: number | null, body: string) {
  return requestAs(userId, "/api/users", { method: "POST", body, headers: { "content-type": "application/json" } });
}

describe("the users API", () => {
  it("answers 401 with the JSON error shape when nobody is signed in", async () => {
    const response = await GET(await requestAs(null, "/api/users"));
    expect(response.status).toBe(401);
    expect(await response.json()).toEqual({ error: { code: "unauthenticated", message: expect.any(String) } });
  });

  it("answers 401 to a forged session token", async () => {
    const request = new Request("http://127.0.0.1:3000/api/users", { headers: { cookie: "next-auth.session-token=not-a-token" } });
    expect((await GET(request)).status).toBe(401);
  });

  it.each(["analyst", "referee", "member"] as const)("refuses the %s role with 403 on list, create and role change", async (role) => {
    expect((await GET(await requestAs(ids[role], "/api/users"))).status).toBe(403);
    const created = await POST(await post(ids[role], JSON.stringify({ email: "x@y.test", name: "X", role: "admin", password: "0123456789" })));
    expect(created.status).toBe(403);
    const patch = await PATCH(
      await requestAs(ids[role], `/api/users/${ids[role]}`, { method: "PATCH", body: JSON.stringify({ role: "admin" }) }),
      { params: Promise.resolve({ id: String(ids[role]) }) },
    );
    expect(patch.status).toBe(403);
    const user = await getDb().models.User.findByPk(ids[role]);
    expect(user?.role).toBe(role);
  });

  it("lets the admin list users without password hashes", async () => {
    const response = await GET(await requestAs(ids.admin, "/api/users"));
    expect(response.status).toBe(200);
    const body = await response.json();
    expect(body.users.length).toBe(4);
    expect(JSON.stringify(body)).not.toMatch(/password|\$2[aby]\$/);
  });

  it("creates a user (201), writes the audit log, and refuses the same e-mail in other case (409)", async () => {
    const response = await POST(await post(ids.admin, JSON.stringify({ email: "New.Person@Example.test", name: "New Person", role: "analyst", password: "a-long-password" })));
    expect(response.status).toBe(201);
    const { user } = await response.json();
    expect(user).toMatchObject({ email: "new.person@example.test", role: "analyst" });
    const entries = await getDb().models.AuditEntry.findAll({ where: { action: "user.create", targetId: String(user.id) } });
    expect(entries).toHaveLength(1);
    const again = await POST(await post(ids.admin, JSON.stringify({ email: "NEW.person@example.test", name: "Twin", role: "member", password: "a-long-password" })));
    expect(again.status).toBe(409);
    expect((await again.json()).error.code).toBe("conflict");
  });

  it("answers 400 to malformed JSON and 422 with field paths to a body that fails the schema", async () => {
    expect((await POST(await post(ids.admin, "{not json"))).status).toBe(400);
    const response = await POST(await post(ids.admin, JSON.stringify({ email: "bad", name: "", role: "overlord", password: "short" })));
    expect(response.status).toBe(422);
    const body = await response.json();
    expect(body.error.code).toBe("validation_failed");
    expect(body.error.issues.map((i: { path: string }) => i.path).sort()).toEqual(["email", "name", "password", "role"]);
  });

  it("changes a role, and the new role takes effect at the next request", async () => {
    const target = await makeUser("member");
    expect((await GET(await requestAs(target.id, "/api/users"))).status).toBe(403);
    const response = await PATCH(
      await requestAs(ids.admin, `/api/users/${target.id}`, { method: "PATCH", body: JSON.stringify({ role: "admin" }) }),
      { params: Promise.resolve({ id: String(target.id) }) },
    );
    expect(response.status).toBe(200);
    expect((await GET(await requestAs(target.id, "/api/users"))).status).toBe(200);
  });

  it("refuses an administrator removing their own admin role (409), and a missing user is 404", async () => {
    const self = await PATCH(
      await requestAs(ids.admin, `/api/users/${ids.admin}`, { method: "PATCH", body: JSON.stringify({ role: "member" }) }),
      { params: Promise.resolve({ id: String(ids.admin) }) },
    );
    expect(self.status).toBe(409);
    const missing = await PATCH(
      await requestAs(ids.admin, "/api/users/999999", { method: "PATCH", body: JSON.stringify({ role: "member" }) }),
      { params: Promise.resolve({ id: "999999" }) },
    );
    expect(missing.status).toBe(404);
    const badId = await PATCH(
      await requestAs(ids.admin, "/api/users/abc", { method: "PATCH", body: JSON.stringify({ role: "member" }) }),
      { params: Promise.resolve({ id: "abc" }) },
    );
    expect(badId.status).toBe(422);
  });

  it("treats a disabled account's session as signed out (401)", async () => {
    const target = await makeUser("analyst");
    await getDb().models.User.update({ disabledAt: new Date() }, { where: { id: target.id } });
    expect((await GET(await requestAs(target.id, "/api/users"))).status).toBe(401);
  });
});

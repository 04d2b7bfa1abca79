import { beforeAll, describe, expect, it } from "vitest";
import { useTestDatabase } from "./database";
import { makeUser, requestAs } from "./auth-helpers";
import { GET as listRoute, POST as createRoute } from "@/app/api/sites/route";
import { GET as getRoute, PUT as putRoute } from "@/app/api/sites/[id]/route";
import { getDb } from "@/lib/db";

useTestDatabase();
const ids: Record<string, number> = {};

beforeAll(async () => {
  for (const role of ["admin", "analyst", "referee", "member"] as const) ids[role] = (await makeUser(role)).id;
});

const SITE = { name: "Invented plateau array", latitudeDeg: "-24.5", longitudeDeg: "-66.2", heightM: "3900", zenithMaxDeg: "70", azimuthConvention: "east-counterclockwise", areaKm2: "", notes: "test" };
const json = (userId: number, url: string, method: string, body: unknown) =>
  requestAs(userId, url, { method, body: JSON.stringify(body), headers: { "content-type": "application/json" } });

describe("the sites API", () => {
  let siteId: number;

  it("lets an analyst create a site from form-style strings, converting numbers and an empty area to null", async () => {
    const response = await createRoute(await json(ids.analyst!, "/api/sites", "POST", SITE));
    expect(response.status).toBe(201);
    const { site } = await response.json();
    expect(site).toMatchObject({ latitudeDeg: -24.5, longitudeDeg: -66.2, heightM: 3900, zenithMaxDeg: 70, areaKm2: null, azimuthConvention: "east-counterclockwise" });
    siteId = site.id;
  });

  it("rejects a latitude outside [-90, 90], a zenith cut of 0 and a blank name with 422 naming each field", async () => {
    const response = await createRoute(await json(ids.admin!, "/api/sites", "POST", { ...SITE, name: " ", latitudeDeg: 91, zenithMaxDeg: 0 }));
    expect(response.status).toBe(422);
    const paths = (await response.json()).error.issues.map((i: { path: string }) => i.path).sort();
    expect(paths).toEqual(["latitudeDeg", "name", "zenithMaxDeg"]);
  });

  it("refuses a second site with the same name (409)", async () => {
    expect((await createRoute(await json(ids.admin!, "/api/sites", "POST", SITE))).status).toBe(409);
  });

  it("updates a site and writes what changed to the audit log", async () => {
    const response = await putRoute(await json(ids.admin!, `/api/sites/${siteId}`, "PUT", { ...SITE, zenithMaxDeg: 60 }), { params: Promise.resolve({ id: String(siteId) }) });
    expect(response.status).toBe(200);
    expect((await response.json()).site.zenithMaxDeg).toBe(60);
    const entry = await getDb().models.AuditEntry.findOne({ where: { action: "site.update", targetId: String(siteId) } });
    expect(entry?.details).toEqual({ zenithMaxDeg: { from: 70, to: 60 } });
  });

  it("refuses referees and members sites (403) and anonymous callers (401)", async () => {
    for (const role of ["referee", "member"]) {
      expect((await listRoute(await requestAs(ids[role]!, "/api/sites"))).status).toBe(403);
      expect((await createRoute(await json(ids[role]!, "/api/sites", "POST", SITE))).status).toBe(403);
      expect((await getRoute(await requestAs(ids[role]!, `/api/sites/${siteId}`), { params: Promise.resolve({ id: String(siteId) }) })).status).toBe(403);
    }
    expect((await listRoute(await requestAs(null, "/api/sites"))).status).toBe(401);
  });
});

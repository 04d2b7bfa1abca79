import { NextResponse } from "next/server";
import { authorize } from "@/lib/auth/session";
import { parseOr422, readJson, route } from "@/lib/http";
import { createCoverageConfiguration, listCoverageConfigurations } from "@/lib/services/coverage";
import { CoverageConfigurationSchema } from "@/lib/validations/coverage";

export const dynamic = "force-dynamic";

/** GET /api/coverage/configurations: every saved configuration (any signed-in role). */
export const GET = route(async (request: Request) => {
  await authorize(request);
  return NextResponse.json({ configurations: await listCoverageConfigurations() });
});

/** POST /api/coverage/configurations { name, latitudeDeg, zenithMaxDeg, areaKm2, liveTimeYr, efficiency, notes }: analyst, admin. */
export const POST = route(async (request: Request) => {
  // session (the role is checked in the service: analysts and admins save)
  const user = await authorize(request);
  // body
  const input = parseOr422(CoverageConfigurationSchema, await readJson(request), "coverage configuration");
  // work and response
  return NextResponse.json({ configuration: await createCoverageConfiguration(user, input) }, { status: 201 });
});

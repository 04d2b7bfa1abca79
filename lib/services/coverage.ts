import "server-only";
import { createHash } from "node:crypto";
import { UniqueConstraintError } from "sequelize";
import { getDb } from "@/lib/db";
import { forbidden, HttpError, notFound } from "@/lib/http";
import { canSaveCoverage } from "@/lib/coverage/access";
import { configurationExposure, coverageCurve, coverageMap, coverageSummary } from "@/lib/coverage/model";
import type { CoverageConfiguration } from "@/models/coverage-configuration";
import { CoverageParametersSchema, type CoverageConfigurationInput, type CoverageParameters, type CoverageQuery } from "@/lib/validations/coverage";
import type { PublicUser } from "./users";
import { audit } from "./audit";

/** What GET /api/coverage answers (JSON form); the map itself is served as binary. */
export interface CoverageResult {
  etag: string;
  json: Record<string, unknown>;
  map: Float32Array;
}

// A small bounded cache of computed answers (least recently used first out): the same query
// from many clients is computed once per process. Keyed by the canonical query; at most 64
// answers and 48 MiB of maps (one Nside-256 map is 3 MiB).
const CACHE_LIMIT = 64;
const CACHE_BYTES = 48 * 1024 * 1024;
const cache = new Map<string, CoverageResult>();
let cachedBytes = 0;

function canonicalKey(q: CoverageQuery): string {
  return JSON.stringify([q.lat, q.zenithMax, q.nside, q.frame, q.decStep, q.areaKm2 ?? null, q.liveTimeYr ?? null]);
}

/** Computes (or takes from the cache) the curve, band, fractions and map of a query. */
export function computeCoverage(q: CoverageQuery): CoverageResult {
  const key = canonicalKey(q);
  const hit = cache.get(key);
  if (hit) {
    cache.delete(key);
    cache.set(key, hit);
    return hit;
  }
  const params: CoverageParameters = { latitudeDeg: q.lat, zenithMaxDeg: q.zenithMax, areaKm2: q.areaKm2 ?? null, liveTimeYr: q.liveTimeYr ?? null, efficiency: { kind: "full", aboveEnergyEeV: null } };
  const exposure = configurationExposure(params);
  const summary = coverageSummary(params, exposure);
  const curve = coverageCurve(exposure, q.decStep);
  const { values } = coverageMap(exposure, q.nside, q.frame);
  const etag = `"cov-${createHash("sha256").update(key).digest("hex").slice(0, 32)}"`;
  const json = {
    latitudeDeg: q.lat,
    zenithMaxDeg: q.zenithMax,
    model: "sommers",
    band: summary.band,
    skyFraction: summary.skyFraction,
    relativeIntegralSr: summary.relativeIntegralSr,
    peakDecDeg: summary.peakDecDeg,
    absolute: summary.absolute,
    curve: { unit: "relative exposure (maximum 1)", decDeg: Array.from(curve.decDeg), exposure: Array.from(curve.exposure, (v) => Math.round(v * 1e9) / 1e9) },
    map: { nside: q.nside, ordering: "RING", coordsys: q.frame === "equatorial" ? "C" : "G", frame: q.frame, pixels: values.length, unit: "relative exposure", format: "little-endian Float32, RING", binaryQuery: "format=binary" },
  };
  const result = { etag, json, map: values };
  cache.set(key, result);
  cachedBytes += values.byteLength;
  while (cache.size > CACHE_LIMIT || cachedBytes > CACHE_BYTES) {
    const oldest = cache.keys().next().value as string;
    cachedBytes -= cache.get(oldest)!.map.byteLength;
    cache.delete(oldest);
  }
  return result;
}

export interface CoverageConfigurationView extends CoverageParameters {
  id: number;
  name: string;
  notes: string;
  ownerId: number | null;
  updatedAt: string;
}

function view(c: CoverageConfiguration): CoverageConfigurationView {
  const params = CoverageParametersSchema.parse({ latitudeDeg: c.latitudeDeg, zenithMaxDeg: c.zenithMaxDeg, areaKm2: c.areaKm2, liveTimeYr: c.liveTimeYr, efficiency: c.efficiency });
  return { id: c.id, name: c.name, notes: c.notes, ownerId: c.ownerId, updatedAt: c.updatedAt.toISOString(), ...params };
}

/** Every saved configuration, by name (any signed-in role reads them). */
export async function listCoverageConfigurations(): Promise<CoverageConfigurationView[]> {
  const rows = await getDb().models.CoverageConfiguration.findAll({ order: [["name", "ASC"]] });
  return rows.map(view);
}

export async function getCoverageConfiguration(id: number): Promise<CoverageConfigurationView> {
  const c = await getDb().models.CoverageConfiguration.findByPk(id);
  if (!c) throw notFound("coverage configuration");
  return view(c);
}

function duplicateName(): HttpError {
  return new HttpError(409, "conflict", "A coverage configuration with this name exists already.", [{ path: "name", message: "Choose another name." }]);
}

/** Saves a new configuration (analyst, admin); audited. */
export async function createCoverageConfiguration(user: PublicUser, input: CoverageConfigurationInput): Promise<CoverageConfigurationView> {
  if (!canSaveCoverage(user.role)) throw forbidden("saving coverage configurations");
  try {
    const c = await getDb().models.CoverageConfiguration.create({
      name: input.name, notes: input.notes, latitudeDeg: input.latitudeDeg, zenithMaxDeg: input.zenithMaxDeg,
      areaKm2: input.areaKm2, liveTimeYr: input.liveTimeYr, efficiency: input.efficiency, ownerId: user.id,
    });
    await audit({ actorId: user.id, action: "coverage.create", targetType: "coverage_configuration", targetId: c.id, details: { name: c.name } });
    return view(c);
  } catch (e) {
    if (e instanceof UniqueConstraintError) throw duplicateName();
    throw e;
  }
}

/** Replaces a configuration's name and parameters (its owner or an admin). Analyses keep the copy they saved. */
export async function updateCoverageConfiguration(user: PublicUser, id: number, input: CoverageConfigurationInput): Promise<CoverageConfigurationView> {
  if (!canSaveCoverage(user.role)) throw forbidden("editing coverage configurations");
  const c = await getDb().models.CoverageConfiguration.findByPk(id);
  if (!c) throw notFound("coverage configuration");
  if (user.role !== "admin" && c.ownerId !== user.id) throw forbidden("this coverage configuration (it is not yours)");
  try {
    await c.update({ name: input.name, notes: input.notes, latitudeDeg: input.latitudeDeg, zenithMaxDeg: input.zenithMaxDeg, areaKm2: input.areaKm2, liveTimeYr: input.liveTimeYr, efficiency: input.efficiency });
  } catch (e) {
    if (e instanceof UniqueConstraintError) throw duplicateName();
    throw e;
  }
  await audit({ actorId: user.id, action: "coverage.update", targetType: "coverage_configuration", targetId: c.id, details: { name: c.name } });
  return view(c);
}

/** Deletes a configuration (its owner or an admin). */
export async function deleteCoverageConfiguration(user: PublicUser, id: number): Promise<void> {
  if (!canSaveCoverage(user.role)) throw forbidden("deleting coverage configurations");
  const c = await getDb().models.CoverageConfiguration.findByPk(id);
  if (!c) throw notFound("coverage configuration");
  if (user.role !== "admin" && c.ownerId !== user.id) throw forbidden("this coverage configuration (it is not yours)");
  await c.destroy();
  await audit({ actorId: user.id, action: "coverage.delete", targetType: "coverage_configuration", targetId: id, details: { name: c.name } });
}

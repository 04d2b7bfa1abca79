import "server-only";
import { UniqueConstraintError } from "sequelize";
import { getDb } from "@/lib/db";
import { HttpError, notFound } from "@/lib/http";
import type { SiteInput } from "@/lib/validations/site";
import { audit } from "./audit";

export interface SiteView extends SiteInput {
  id: number;
  updatedAt: Date;
}

const ATTRIBUTES = ["id", "name", "latitudeDeg", "longitudeDeg", "heightM", "zenithMaxDeg", "azimuthConvention", "areaKm2", "notes", "updatedAt"] as const;

function view(s: InstanceType<ReturnType<typeof getDb>["models"]["Site"]>): SiteView {
  return {
    id: s.id, name: s.name, latitudeDeg: s.latitudeDeg, longitudeDeg: s.longitudeDeg, heightM: s.heightM,
    zenithMaxDeg: s.zenithMaxDeg, azimuthConvention: s.azimuthConvention, areaKm2: s.areaKm2, notes: s.notes, updatedAt: s.updatedAt,
  };
}

function conflict(error: unknown): never {
  if (error instanceof UniqueConstraintError) {
    throw new HttpError(409, "conflict", "A site with this name already exists.", [{ path: "name", message: "Already in use." }]);
  }
  throw error;
}

export async function listSites(): Promise<SiteView[]> {
  return (await getDb().models.Site.findAll({ attributes: [...ATTRIBUTES], order: [["name", "ASC"]] })).map(view);
}

export async function getSite(id: number): Promise<SiteView> {
  const site = await getDb().models.Site.findByPk(id, { attributes: [...ATTRIBUTES] });
  if (!site) throw notFound("site");
  return view(site);
}

export async function createSite(input: SiteInput, actorId: number): Promise<SiteView> {
  try {
    const site = await getDb().models.Site.create({ ...input, createdBy: actorId });
    await audit({ actorId, action: "site.create", targetType: "site", targetId: site.id, details: { name: site.name } });
    return view(site);
  } catch (error) {
    conflict(error);
  }
}

export async function updateSite(id: number, input: SiteInput, actorId: number): Promise<SiteView> {
  const site = await getDb().models.Site.findByPk(id);
  if (!site) throw notFound("site");
  const before = view(site);
  site.set(input);
  try {
    await site.save();
  } catch (error) {
    conflict(error);
  }
  const changed = Object.fromEntries(
    (Object.keys(input) as (keyof SiteInput)[]).filter((k) => before[k] !== input[k]).map((k) => [k, { from: before[k], to: input[k] }]),
  );
  await audit({ actorId, action: "site.update", targetType: "site", targetId: id, details: changed });
  return view(site);
}

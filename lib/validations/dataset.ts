import { z } from "zod";

const bool = z.preprocess((v) => (v === "true" || v === "1" || v === "on" ? true : v === "false" || v === "0" || v === "" ? false : v), z.boolean());
const header = z.string().trim().min(1).max(200).optional();

/** How the columns of an uploaded CSV map onto the canonical event (METHODS section 1). */
export const MappingSchema = z.object({
  timeFormat: z.enum(["iso", "unix", "gps"]).default("iso"),
  azimuthConvention: z.enum(["north-clockwise", "east-counterclockwise"]).default("north-clockwise"),
  energyUnit: z.enum(["EeV", "eV", "log10eV"]).default("EeV"),
  columns: z
    .object({ id: header, time: header, zenith: header, azimuth: header, energy: header })
    .default({}),
});
export type Mapping = z.infer<typeof MappingSchema>;

/** Query parameters of POST /api/datasets (the body is the CSV file itself, optionally gzip-compressed). */
export const NewDatasetQuerySchema = z.object({
  name: z.string().trim().min(1, "Give the dataset a name.").max(160),
  siteId: z.coerce.number().int().positive("Choose a site."),
  description: z.string().max(4000).default(""),
  fileName: z.string().trim().max(255).default("upload.csv"),
  timeFormat: MappingSchema.shape.timeFormat,
  azimuthConvention: MappingSchema.shape.azimuthConvention,
  energyUnit: MappingSchema.shape.energyUnit,
  idColumn: header,
  timeColumn: header,
  zenithColumn: header,
  azimuthColumn: header,
  energyColumn: header,
  dropBadRows: bool.default(false),
  blinded: bool.default(false),
});
export type NewDatasetQuery = z.infer<typeof NewDatasetQuerySchema>;

/** Query parameters of POST /api/datasets/:id/batches: the mapping is the dataset's own. */
export const AppendQuerySchema = z.object({
  fileName: z.string().trim().max(255).default("batch.csv"),
  dropBadRows: bool.default(false),
});

/** GET /api/datasets: server-side sorting, filtering and pagination. */
export const DatasetListQuerySchema = z.object({
  q: z.string().trim().max(100).default(""),
  siteId: z.coerce.number().int().positive().optional(),
  sort: z.enum(["name", "createdAt", "eventCount", "timeStart"]).default("createdAt"),
  dir: z.enum(["asc", "desc"]).default("desc"),
  page: z.coerce.number().int().min(1).default(1),
  pageSize: z.coerce.number().int().min(1).max(100).default(20),
});
export type DatasetListQuery = z.infer<typeof DatasetListQuerySchema>;

export function mappingFromQuery(q: NewDatasetQuery): Mapping {
  return {
    timeFormat: q.timeFormat,
    azimuthConvention: q.azimuthConvention,
    energyUnit: q.energyUnit,
    columns: { id: q.idColumn, time: q.timeColumn, zenith: q.zenithColumn, azimuth: q.azimuthColumn, energy: q.energyColumn },
  };
}

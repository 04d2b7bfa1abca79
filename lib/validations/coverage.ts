import { z } from "zod";

/** Nside values the coverage API and planner accept (powers of two; 256 = 786,432 pixels at most). */
export const COVERAGE_NSIDES = [1, 2, 4, 8, 16, 32, 64, 128, 256] as const;

/** An empty form field or query value is missing, not 0. */
const blankToUndefined = (v: unknown) => (typeof v === "string" && v.trim() === "" ? undefined : v);

const latitude = z.preprocess(blankToUndefined, z.coerce.number({ error: "The latitude is a number of degrees." })
  .refine(Number.isFinite, "The latitude is a number of degrees.")
  .min(-90, "The latitude is between -90° and 90°.").max(90, "The latitude is between -90° and 90°."));
const zenithCut = z.preprocess(blankToUndefined, z.coerce.number({ error: "The zenith cut is a number of degrees." })
  .refine(Number.isFinite, "The zenith cut is a number of degrees.")
  .gt(0, "The zenith cut is above 0°.").max(90, "The zenith cut is at most 90°."));

/**
 * Zenith-dependent detection efficiency of a configuration: `full` (fully efficient up to the
 * cut, e.g. above an energy the user names) or a `table` of efficiency against zenith angle,
 * linearly interpolated (lib/sky/efficiency-exposure.ts).
 */
export const EfficiencySchema = z.discriminatedUnion("kind", [
  z.object({
    kind: z.literal("full"),
    /** Energy above which the array is fully efficient (EeV); informative, saved with the configuration. */
    aboveEnergyEeV: z.number().positive("The energy is above 0 EeV.").nullable().default(null),
  }),
  z.object({
    kind: z.literal("table"),
    zenithDeg: z.array(z.number().min(0, "Zenith angles are in [0°, 90°].").max(90, "Zenith angles are in [0°, 90°].")).min(2, "Give at least two rows.").max(50, "At most 50 rows."),
    efficiency: z.array(z.number().min(0, "Efficiencies are in [0, 1].").max(1, "Efficiencies are in [0, 1].")).min(2).max(50),
  }).superRefine((t, ctx) => {
    if (t.efficiency.length !== t.zenithDeg.length) ctx.addIssue({ code: "custom", path: ["efficiency"], message: "Give one efficiency per zenith angle." });
    for (let i = 1; i < t.zenithDeg.length; i++) {
      if (!(t.zenithDeg[i]! > t.zenithDeg[i - 1]!)) { ctx.addIssue({ code: "custom", path: ["zenithDeg", i], message: "Zenith angles must increase from row to row." }); break; }
    }
    if (t.efficiency.every((e) => e === 0)) ctx.addIssue({ code: "custom", path: ["efficiency"], message: "An efficiency of zero everywhere sees nothing." });
  }),
]);
export type EfficiencyInput = z.infer<typeof EfficiencySchema>;

/** The parameters of a coverage configuration: what changes its numbers. */
export const CoverageParametersSchema = z.object({
  latitudeDeg: latitude,
  zenithMaxDeg: zenithCut,
  /** Horizontal area of the array, km^2 (optional; with liveTimeYr gives absolute exposure). */
  areaKm2: z.preprocess(blankToUndefined, z.coerce.number().positive("The area is above 0 km².").max(1e5, "The area is at most 100,000 km².").nullable().default(null)),
  /** Live time, years (optional). */
  liveTimeYr: z.preprocess(blankToUndefined, z.coerce.number().positive("The live time is above 0 years.").max(1000, "The live time is at most 1000 years.").nullable().default(null)),
  efficiency: EfficiencySchema.default({ kind: "full", aboveEnergyEeV: null }),
});
export type CoverageParameters = z.infer<typeof CoverageParametersSchema>;

/** A saved coverage configuration: a name and its parameters (POST/PUT /api/coverage/configurations). */
export const CoverageConfigurationSchema = CoverageParametersSchema.extend({
  name: z.string().trim().min(1, "Give the configuration a name.").max(120, "At most 120 characters."),
  notes: z.string().trim().max(2000).default(""),
});
export type CoverageConfigurationInput = z.infer<typeof CoverageConfigurationSchema>;

/** Query of GET /api/coverage. The names lat, zenithMax and nside are part of the API contract. */
export const CoverageQuerySchema = z.object({
  lat: latitude,
  zenithMax: zenithCut,
  nside: z.preprocess(blankToUndefined, z.coerce.number({ error: "Nside is a power of two from 1 to 256." }).int("Nside is a power of two from 1 to 256.")
    .refine((n) => (COVERAGE_NSIDES as readonly number[]).includes(n), `Nside is one of ${COVERAGE_NSIDES.join(", ")}.`).default(64)),
  /** json (default): curve, band, fractions and map metadata; binary: the map as little-endian Float32, RING. */
  format: z.enum(["json", "binary"]).default("json"),
  /** Frame of the map's pixels. */
  frame: z.enum(["equatorial", "galactic"]).default("equatorial"),
  /** Declination step of the curve, degrees. */
  decStep: z.coerce.number().min(0.1, "The declination step is at least 0.1°.").max(10, "The declination step is at most 10°.").default(1),
  areaKm2: z.preprocess(blankToUndefined, z.coerce.number().positive("The area is above 0 km².").max(1e5).optional()),
  liveTimeYr: z.preprocess(blankToUndefined, z.coerce.number().positive("The live time is above 0 years.").max(1000).optional()),
});
export type CoverageQuery = z.infer<typeof CoverageQuerySchema>;

/** One user-entered direction of the visibility table (ICRS degrees). */
export const DirectionSchema = z.object({
  name: z.string().trim().min(1, "Give the direction a name.").max(80, "At most 80 characters."),
  raDeg: z.coerce.number({ error: "RA is a number of degrees." }).refine(Number.isFinite, "RA is a number of degrees.").min(0, "RA is in [0°, 360°).").lt(360, "RA is in [0°, 360°)."),
  decDeg: z.coerce.number({ error: "Dec is a number of degrees." }).refine(Number.isFinite, "Dec is a number of degrees.").min(-90, "Dec is in [-90°, 90°].").max(90, "Dec is in [-90°, 90°]."),
});
export type DirectionInput = z.infer<typeof DirectionSchema>;

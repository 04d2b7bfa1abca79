import { z } from "zod";
import { EfficiencySchema } from "./coverage";

const NSIDES = [16, 32, 64, 128, 256] as const;

/**
 * Settings of an analysis: everything that changes its numbers, and nothing else (name and
 * purpose live beside them). Canonicalised and hashed (lib/analyses/canonical.ts).
 */
const AnalysisSettingsObject = z.object({
  kind: z.enum(["hotspot", "large-scale"]),
  datasetId: z.coerce.number().int().positive(),
  datasetVersion: z.coerce.number().int().positive(),
  zenithMaxDeg: z.coerce.number().gt(0, "The zenith cut is above 0°.").max(90, "The zenith cut is at most 90°."),
  energyThresholdsEeV: z.array(z.coerce.number().nonnegative("Energy thresholds are not negative.")).max(5, "At most 5 energy thresholds.").default([]),
  nside: z.coerce.number().int().refine((n) => (NSIDES as readonly number[]).includes(n), `Nside is one of ${NSIDES.join(", ")}.`).default(64),
  radiiDeg: z.array(z.coerce.number().gt(0, "A window radius is above 0°.").max(60, "A window radius is at most 60°.")).min(1, "Give at least one window radius.").max(6, "At most 6 radii.").default([20]),
  exposure: z.enum(["sommers", "sommers-precessed", "scrambled"]).default("sommers-precessed"),
  nScramble: z.coerce.number().int().min(1).max(100).default(10),
  nSkies: z.coerce.number().int().min(10, "Use at least 10 isotropic skies.").max(10_000, "At most 10,000 isotropic skies.").default(1000),
  seed: z.coerce.number().int().min(0).max(2 ** 31 - 1),
  weighted: z.boolean().default(false),
  /**
   * Optional: a saved coverage configuration used as the exposure (latitude, zenith cut and
   * efficiency copied in when the analysis is created, so it stays reproducible if the
   * configuration is edited later). Absent in analyses without one: their settings hashes are
   * unchanged.
   */
  coverage: z.object({
    configurationId: z.number().int().positive(),
    name: z.string(),
    latitudeDeg: z.number().min(-90).max(90),
    zenithMaxDeg: z.number().gt(0).max(90),
    efficiency: EfficiencySchema,
  }).optional(),
});

const analyticWithCoverage = (s: { exposure: string; coverage?: unknown; coverageConfigurationId?: unknown }) => !((s.coverage || s.coverageConfigurationId) && s.exposure === "scrambled");
const ANALYTIC_ONLY = { path: ["exposure"], message: "A coverage configuration is an analytic exposure: choose an analytic model, not time scrambling." };

export const AnalysisSettingsSchema = AnalysisSettingsObject.refine(analyticWithCoverage, ANALYTIC_ONLY);
export type AnalysisSettings = z.infer<typeof AnalysisSettingsSchema>;

/** The form and POST /api/analyses: settings plus name and purpose; the version defaults to the latest. */
export const NewAnalysisSchema = z.object({
  name: z.string().trim().min(1, "Give the analysis a name.").max(160),
  purpose: z.string().trim().max(4000).default(""),
  settings: AnalysisSettingsObject.extend({
    datasetVersion: z.coerce.number().int().positive().optional(),
    /** A saved coverage configuration to use as the exposure (its parameters are copied into the settings). */
    coverageConfigurationId: z.coerce.number().int().positive().optional(),
  }).refine(analyticWithCoverage, ANALYTIC_ONLY),
});
export type NewAnalysisInput = z.infer<typeof NewAnalysisSchema>;

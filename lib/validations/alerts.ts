import { z } from "zod";

const sigma = (what: string) => z.coerce.number().min(0, `${what} is at least 0σ.`).max(50, `${what} is at most 50σ.`);

/** A new subscription: one watched analysis (analysisId) or every published one (analysisId null). */
export const SubscriptionSchema = z.object({
  analysisId: z.coerce.number().int().positive().nullable(),
  localSigmaThreshold: sigma("The local threshold").default(4),
  postTrialSigmaThreshold: sigma("The post-trial threshold").nullable().default(null),
  delivery: z.enum(["immediate", "daily-digest"]).default("immediate"),
});
export type SubscriptionInput = z.infer<typeof SubscriptionSchema>;

/** Changes to a subscription: thresholds, delivery, pause. */
export const SubscriptionUpdateSchema = z
  .object({
    localSigmaThreshold: sigma("The local threshold").optional(),
    postTrialSigmaThreshold: sigma("The post-trial threshold").nullable().optional(),
    delivery: z.enum(["immediate", "daily-digest"]).optional(),
    paused: z.boolean().optional(),
  })
  .refine((v) => Object.keys(v).length > 0, "Give at least one field to change.");
export type SubscriptionUpdate = z.infer<typeof SubscriptionUpdateSchema>;

/** Watching an analysis: on or off, the deduplication distance (default: the window radius) and the update step. */
export const WatchSchema = z.object({
  watched: z.boolean(),
  dedupRadiusDeg: z.coerce.number().gt(0, "The distance is above 0°.").max(90, "The distance is at most 90°.").nullable().default(null),
  updateStepSigma: z.coerce.number().gt(0, "The step is above 0σ.").max(20, "The step is at most 20σ.").default(1),
});
export type WatchInput = z.infer<typeof WatchSchema>;

/** The token of an unsubscribe link. */
export const UnsubscribeSchema = z.object({ token: z.string().min(10, "The link is incomplete.").max(2000) });

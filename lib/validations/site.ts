import { z } from "zod";

export const AZIMUTH_CONVENTIONS = ["north-clockwise", "east-counterclockwise"] as const;

/** Numbers typed in forms arrive as strings; accept both, reject blanks and non-finite values. */
const finite = (label: string) =>
  z.preprocess(
    (v) => (typeof v === "string" && v.trim() !== "" ? Number(v) : v),
    z.number({ message: `Enter the ${label} as a number.` }).finite(`Enter the ${label} as a number.`),
  );

/** An array site: geodetic position (WGS84 degrees, metres), default zenith cut, azimuth convention. */
export const SiteSchema = z.object({
  name: z.string().trim().min(1, "Enter a name.").max(120),
  latitudeDeg: finite("latitude").pipe(z.number().min(-90, "Latitude is between -90 and 90 degrees.").max(90, "Latitude is between -90 and 90 degrees.")),
  longitudeDeg: finite("longitude").pipe(z.number().min(-180, "Longitude is between -180 and 180 degrees (east positive).").max(180, "Longitude is between -180 and 180 degrees (east positive).")),
  heightM: finite("height").pipe(z.number().min(-500, "Height is between -500 and 9000 m.").max(9000, "Height is between -500 and 9000 m.")),
  zenithMaxDeg: finite("zenith cut").pipe(z.number().gt(0, "The zenith cut is above 0 degrees.").max(90, "The zenith cut is at most 90 degrees.")),
  azimuthConvention: z.enum(AZIMUTH_CONVENTIONS, { message: "Choose an azimuth convention." }),
  areaKm2: z.preprocess(
    (v) => (v === "" || v === null || v === undefined ? null : typeof v === "string" ? Number(v) : v),
    z.number().positive("The array area is a positive number of km².").finite().nullable(),
  ),
  notes: z.string().max(4000).default(""),
});
export type SiteInput = z.infer<typeof SiteSchema>;

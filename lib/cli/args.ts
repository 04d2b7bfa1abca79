/**
 * Option parsing shared by all commands, on node:util parseArgs (strict: unknown options and
 * positional arguments are usage errors).
 *
 * Common options (every command accepts them; each command decides which it needs):
 *   --events FILE                      event CSV (METHODS section 1)
 *   --lat DEG, --lon DEG, --height M   array site (geodetic latitude, east longitude, height)
 *   --zenith-max DEG                   zenith cut and exposure limit, (0, 90]
 *   --azimuth-convention north-clockwise|east-counterclockwise   (default north-clockwise)
 *   --energy-min EEV                   energy threshold (events of unknown energy are then cut)
 *   --time-format iso|unix|gps         (default iso)
 *   --energy-unit EeV|eV|log10eV       (default EeV)
 *   --drop-bad-rows                    drop bad rows instead of rejecting the file
 */
import { parseArgs } from "node:util";
import type { AzimuthConvention } from "../sky/coordinates";
import type { EnergyUnit } from "../sky/event-csv";
import type { TimeFormat } from "../sky/time";
import { UsageError } from "./errors";

/** The validated common options. Undefined = not given. */
export interface CommonOptions {
  events?: string;
  latDeg?: number;
  lonDeg?: number;
  heightM: number;
  zenithMaxDeg?: number;
  azimuthConvention: AzimuthConvention;
  energyMinEeV?: number;
  timeFormat: TimeFormat;
  energyUnit: EnergyUnit;
  dropBadRows: boolean;
}

/** Declaration of a command's own options, as node:util parseArgs takes them. */
export type ExtraOptions = Record<string, { type: "string" | "boolean"; short?: string; default?: string | boolean; multiple?: false }>;

/** Result of parseCommandArgs: the common options and the raw values of the command's own options. */
export interface ParsedCommandArgs {
  common: CommonOptions;
  /** Raw values of the extra options (strings, booleans, or undefined when absent). */
  extra: Record<string, string | boolean | undefined>;
  help: boolean;
}

const COMMON_OPTIONS = {
  events: { type: "string" },
  lat: { type: "string" },
  lon: { type: "string" },
  height: { type: "string" },
  "zenith-max": { type: "string" },
  "azimuth-convention": { type: "string" },
  "energy-min": { type: "string" },
  "time-format": { type: "string" },
  "energy-unit": { type: "string" },
  "drop-bad-rows": { type: "boolean" },
  help: { type: "boolean", short: "h" },
} as const;

/** Names of the common options (without the leading --). */
export const COMMON_OPTION_NAMES: readonly string[] = Object.keys(COMMON_OPTIONS);

/** Range rules for parseNumberOption. */
export interface NumberRule {
  min?: number;
  max?: number;
  /** Exclusive lower bound. */
  above?: number;
  integer?: boolean;
}

/**
 * Parses and validates a numeric option value: a finite decimal number within the rule, else a
 * UsageError naming the option. Undefined stays undefined.
 */
export function parseNumberOption(raw: string | boolean | undefined, name: string, rule: NumberRule = {}): number | undefined {
  if (raw === undefined) return undefined;
  if (typeof raw !== "string" || raw.trim() === "" || !/^[+-]?(\d+\.?\d*|\.\d+)([eE][+-]?\d+)?$/.test(raw.trim())) {
    throw new UsageError(`--${name} needs a number, got "${String(raw)}"`);
  }
  const v = Number(raw);
  if (!Number.isFinite(v)) throw new UsageError(`--${name} needs a finite number, got "${raw}"`);
  if (rule.integer && !Number.isInteger(v)) throw new UsageError(`--${name} needs an integer, got ${raw}`);
  if (rule.min !== undefined && v < rule.min) throw new UsageError(`--${name} must be >= ${rule.min}, got ${raw}`);
  if (rule.max !== undefined && v > rule.max) throw new UsageError(`--${name} must be <= ${rule.max}, got ${raw}`);
  if (rule.above !== undefined && !(v > rule.above)) throw new UsageError(`--${name} must be > ${rule.above}, got ${raw}`);
  return v;
}

function choice<T extends string>(raw: string | undefined, name: string, allowed: readonly T[], fallback: T): T {
  if (raw === undefined) return fallback;
  if (!(allowed as readonly string[]).includes(raw)) throw new UsageError(`--${name} must be one of ${allowed.join(", ")}, got "${raw}"`);
  return raw as T;
}

/**
 * Parses a command's argv (the arguments after the command word) with the common options and
 * the command's extraOptions. Throws UsageError on unknown options, positionals, bad values.
 */
export function parseCommandArgs(argv: string[], extraOptions: ExtraOptions = {}): ParsedCommandArgs {
  for (const k of Object.keys(extraOptions)) if (k in COMMON_OPTIONS) throw new Error(`option --${k} is already a common option`);
  const options = { ...COMMON_OPTIONS, ...extraOptions } as Record<string, { type: "string" | "boolean" }>;
  // parseArgs reads "--lat -35.2" as an option followed by an option: join negative numbers
  const args: string[] = [];
  for (let i = 0; i < argv.length; i++) {
    const a = argv[i];
    const name = a.startsWith("--") ? a.slice(2) : "";
    if (name && options[name]?.type === "string" && i + 1 < argv.length && /^-(\d|\.\d)/.test(argv[i + 1])) { args.push(`${a}=${argv[i + 1]}`); i++; }
    else args.push(a);
  }
  let parsed: { values: Record<string, string | boolean | undefined>; positionals: string[] };
  try {
    parsed = parseArgs({ args, options: { ...COMMON_OPTIONS, ...extraOptions }, strict: true, allowPositionals: true }) as typeof parsed;
  } catch (e) {
    const msg = e instanceof Error ? e.message.split("\n")[0] : String(e);
    throw new UsageError(msg.replace(/\. To specify a positional argument.*$/, ""));
  }
  const v = parsed.values;
  if (parsed.positionals.length) throw new UsageError(`unexpected argument "${parsed.positionals[0]}"`);
  const str = (k: string): string | undefined => (typeof v[k] === "string" ? (v[k] as string) : undefined);
  const events = str("events");
  if (events !== undefined && events.trim() === "") throw new UsageError("--events needs a file path");
  const common: CommonOptions = {
    events,
    latDeg: parseNumberOption(v.lat, "lat", { min: -90, max: 90 }),
    lonDeg: parseNumberOption(v.lon, "lon", { min: -180, max: 360 }),
    heightM: parseNumberOption(v.height, "height", { min: -500, max: 10000 }) ?? 0,
    zenithMaxDeg: parseNumberOption(v["zenith-max"], "zenith-max", { above: 0, max: 90 }),
    azimuthConvention: choice(str("azimuth-convention"), "azimuth-convention", ["north-clockwise", "east-counterclockwise"] as const, "north-clockwise"),
    energyMinEeV: parseNumberOption(v["energy-min"], "energy-min", { min: 0 }),
    timeFormat: choice(str("time-format"), "time-format", ["iso", "unix", "gps"] as const, "iso"),
    energyUnit: choice(str("energy-unit"), "energy-unit", ["EeV", "eV", "log10eV"] as const, "EeV"),
    dropBadRows: v["drop-bad-rows"] === true,
  };
  const extra: Record<string, string | boolean | undefined> = {};
  for (const k of Object.keys(extraOptions)) extra[k] = v[k];
  return { common, extra, help: v.help === true };
}

/** Throws a UsageError unless the named common options are present. */
export function requireOptions(common: CommonOptions, names: ReadonlyArray<"events" | "lat" | "lon" | "zenith-max">): void {
  const map = { events: common.events, lat: common.latDeg, lon: common.lonDeg, "zenith-max": common.zenithMaxDeg } as const;
  const missing = names.filter((n) => map[n] === undefined);
  if (missing.length) throw new UsageError(`missing required option${missing.length > 1 ? "s" : ""} ${missing.map((n) => `--${n}`).join(", ")}`);
}

/**
 * Loads an event CSV for a command: streams the file in chunks through the event-CSV parser,
 * applies the --energy-min and --zenith-max cuts, and converts the arrival directions to ICRS
 * (lib/sky/coordinates.ts). Node-only (reads files).
 */
import { createReadStream } from "node:fs";
import { stat } from "node:fs/promises";
import { horizontalToEquatorial, type Site } from "../sky/coordinates";
import { decodeIdBytes, EventCsvParser } from "../sky/event-csv";
import { requireOptions, type CommonOptions } from "./args";
import { CliError } from "./errors";

/** Events after cuts, with ICRS directions. All arrays have length n. */
export interface LoadedEvents {
  n: number;
  /** Event ids (decoded on first read when idBytes is set). */
  ids: string[];
  /** The ids as UTF-8 bytes when the parser kept them so (see EventTable.idBytes), after cuts. */
  idBytes?: { bytes: Uint8Array; ends: Int32Array; ascii: boolean };
  /** Arrival time, Unix ms UTC. */
  unixMs: Float64Array;
  zenithDeg: Float64Array;
  /** North-clockwise. */
  azimuthDeg: Float64Array;
  /** NaN = unknown. */
  energyEeV: Float64Array;
  /** ICRS right ascension [0, 360) and declination [-90, 90], degrees. */
  raDeg: Float64Array;
  decDeg: Float64Array;
  /** ICRS unit vectors. */
  x: Float64Array;
  y: Float64Array;
  z: Float64Array;
  /** Line number of each event in the file (header = 1). */
  lineNumber: Int32Array;
  site: Site;
  /** Rows in the file that passed parsing, before cuts. */
  nRead: number;
  /** Bad rows dropped (only with --drop-bad-rows). */
  droppedBadRows: number;
  /** Events removed by the cuts. */
  cutByEnergy: number;
  cutByZenith: number;
  timingsMs: { read: number; convert: number };
}

const CHUNK_BYTES = 1 << 20;

/**
 * Reads and prepares the events named by --events at the site --lat/--lon/--height. Cuts:
 * energy >= --energy-min (unknown energies are cut when a threshold is given), zenith <=
 * --zenith-max. Any bad row rejects the file (CliError naming its line) unless --drop-bad-rows.
 */
export async function loadEvents(opts: CommonOptions): Promise<LoadedEvents> {
  requireOptions(opts, ["events", "lat", "lon"]);
  const path = opts.events as string;
  const t0 = performance.now();
  let sizeBytes = 0;
  try {
    const st = await stat(path);
    sizeBytes = st.size;
    if (!st.isFile()) throw new CliError(`cannot read events file "${path}": not a regular file`);
  } catch (e) {
    if (e instanceof CliError) throw e;
    const code = (e as NodeJS.ErrnoException).code;
    throw new CliError(`cannot read events file "${path}": ${code === "ENOENT" ? "no such file" : code === "EACCES" ? "permission denied" : (e as Error).message}`);
  }
  const parser = new EventCsvParser({
    timeFormat: opts.timeFormat, azimuthConvention: opts.azimuthConvention, energyUnit: opts.energyUnit,
    badRows: opts.dropBadRows ? "drop" : "reject", sizeHintBytes: sizeBytes,
  });
  try {
    // raw bytes: the parser reads plain ASCII lines straight from them and decodes UTF-8 itself
    const stream = createReadStream(path, { highWaterMark: CHUNK_BYTES });
    for await (const chunk of stream as AsyncIterable<Buffer>) parser.feedBytes(chunk);
  } catch (e) {
    throw new CliError(`cannot read events file "${path}": ${(e as Error).message}`);
  }
  const result = parser.end();
  if (!result.ok) {
    const first = result.badRows[0];
    if (result.headerError) throw new CliError(`${path}: line 1: ${result.headerError}`);
    const more = result.badRowCount > 1 ? ` (${result.badRowCount - 1} more bad row${result.badRowCount > 2 ? "s" : ""}; lines ${result.badRows.slice(0, 10).map((b) => b.line).join(", ")}${result.badRowCount > 10 ? ", ..." : ""}; use --drop-bad-rows to drop them)` : " (use --drop-bad-rows to drop bad rows)";
    throw new CliError(`${path}: line ${first.line}: ${first.reason}${more}`);
  }
  const t = result.table;
  const tRead = performance.now();

  // cuts, compacting in place
  const eMin = opts.energyMinEeV, zMax = opts.zenithMaxDeg;
  let cutE = 0, cutZ = 0, n = 0;
  const keepAll = eMin === undefined && zMax === undefined;
  // ids kept as bytes are compacted as bytes (no strings made); else the string array
  const idb = t.idBytes;
  const ids = idb ? null : t.ids;
  let idBytes = idb;
  let byteEnd = 0, from = 0;
  if (!keepAll) {
    for (let i = 0; i < t.n; i++) {
      const idStart = from;
      if (idb) from = idb.ends[i];
      if (eMin !== undefined && !(t.energyEeV[i] >= eMin)) { cutE++; continue; }
      if (zMax !== undefined && !(t.zenithDeg[i] <= zMax)) { cutZ++; continue; }
      if (n !== i) {
        t.unixMs[n] = t.unixMs[i]; t.zenithDeg[n] = t.zenithDeg[i]; t.azimuthDeg[n] = t.azimuthDeg[i];
        t.energyEeV[n] = t.energyEeV[i]; t.lineNumber[n] = t.lineNumber[i];
        if (ids) ids[n] = ids[i];
      }
      if (idb) {
        if (byteEnd !== idStart) idb.bytes.copyWithin(byteEnd, idStart, from);
        byteEnd += from - idStart;
        idb.ends[n] = byteEnd;
      }
      n++;
    }
    if (ids) ids.length = n;
    if (idb) idBytes = { bytes: idb.bytes.subarray(0, byteEnd), ends: idb.ends.subarray(0, n), ascii: idb.ascii };
  } else n = t.n;
  let idList: string[] | null = ids;
  const idsOf = (): string[] => {
    if (idList) return idList;
    const b = idBytes as NonNullable<typeof idBytes>;
    const out = decodeIdBytes(b.bytes, b.ends, b.ascii);
    return (idList = out);
  };
  const unixMs = t.unixMs.subarray(0, n), zenithDeg = t.zenithDeg.subarray(0, n), azimuthDeg = t.azimuthDeg.subarray(0, n);
  const site: Site = { latitudeDeg: opts.latDeg as number, longitudeDeg: opts.lonDeg as number, heightM: opts.heightM };
  const eq = horizontalToEquatorial({ zenithDeg, azimuthDeg, unixMs }, site);
  const tConv = performance.now();
  const loaded: LoadedEvents = {
    n, ids: [], idBytes, unixMs, zenithDeg, azimuthDeg, energyEeV: t.energyEeV.subarray(0, n),
    raDeg: eq.raDeg, decDeg: eq.decDeg, x: eq.x, y: eq.y, z: eq.z, lineNumber: t.lineNumber.subarray(0, n),
    site, nRead: t.n, droppedBadRows: result.droppedRows, cutByEnergy: cutE, cutByZenith: cutZ,
    timingsMs: { read: tRead - t0, convert: tConv - tRead },
  };
  Object.defineProperty(loaded, "ids", { enumerable: true, configurable: true, get: idsOf, set: (v: string[]) => { idList = v; } });
  return loaded;
}

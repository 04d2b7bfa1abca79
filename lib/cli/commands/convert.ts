/**
 * `siderea convert --events FILE --lat DEG --lon DEG [--height M] [common options]`
 *
 * Writes CSV to stdout with header `id,ra,dec,l,b`: ICRS right ascension and declination and
 * galactic longitude and latitude of each event's arrival direction, degrees with 6 decimals
 * (ra and l in [0, 360)). Cuts (--energy-min, --zenith-max) apply as in every command.
 */
import { icrsToGalacticMatrix, vectorsToRotatedLonLatDeg } from "../../sky/coordinates";
import { parseCommandArgs, requireOptions } from "../args";
import { loadEvents } from "../load-events";

const USAGE = "usage: siderea convert --events FILE --lat DEG --lon DEG [--height M] [--zenith-max DEG] [--energy-min EEV] [--time-format iso|unix|gps] [--azimuth-convention north-clockwise|east-counterclockwise] [--energy-unit EeV|eV|log10eV] [--drop-bad-rows]";

/** Runs the convert command with the arguments after the command word; output to `stdout` (default process.stdout). */
export async function run(argv: string[], stdout: NodeJS.WritableStream = process.stdout): Promise<void> {
  const { common, help } = parseCommandArgs(argv);
  if (help) { stdout.write(`${USAGE}\n`); return; }
  requireOptions(common, ["events", "lat", "lon"]);
  const ev = await loadEvents(common);
  const gal = vectorsToRotatedLonLatDeg(icrsToGalacticMatrix(), ev);
  const out = new ByteWriter(stdout);
  out.ascii("id,ra,dec,l,b\n");
  const { raDeg, decDeg } = ev;
  const { lonDeg, latDeg } = gal;
  // ASCII ids kept as bytes by the parser are copied as bytes (no string per row)
  const idb = ev.idBytes && ev.idBytes.ascii ? ev.idBytes : null;
  let idFrom = 0;
  for (let i = 0; i < ev.n; i++) {
    if (idb) {
      const idTo = idb.ends[i];
      out.reserve(256 + idTo - idFrom);
      if (!out.plainBytes(idb.bytes, idFrom, idTo)) { const id = ev.ids[i]; out.reserve(6 * id.length); out.text(csvField(id)); }
      idFrom = idTo;
    } else {
      const id = ev.ids[i];
      out.reserve(256 + 6 * id.length);
      if (!out.plainField(id)) out.text(csvField(id));
    }
    out.byte(44); out.fixed6(raDeg[i], true);
    out.byte(44); out.fixed6(decDeg[i], false);
    out.byte(44); out.fixed6(lonDeg[i], true);
    out.byte(44); out.fixed6(latDeg[i], false);
    out.byte(10);
    if (out.length >= FLUSH_BYTES) await out.flush();
  }
  await out.flush();
  await out.end();
}

const FLUSH_BYTES = 1 << 20;

/** ASCII digits of 00..99: pair k at [2k, 2k + 1]. */
const DIGIT_PAIRS = new Uint8Array(200);
for (let k = 0; k < 100; k++) { DIGIT_PAIRS[2 * k] = 48 + ((k / 10) | 0); DIGIT_PAIRS[2 * k + 1] = 48 + (k % 10); }

const NEEDS_QUOTES = /[",\r\n]/;

/** RFC 4180 quoting of a field when it holds a comma, quote or line break (else unchanged). */
function csvField(v: string): string {
  return NEEDS_QUOTES.test(v) ? `"${v.replace(/"/g, '""')}"` : v;
}

/**
 * Formats a finite number with exactly 6 decimals (rounding v x 1e6 half away from zero, which
 * can differ from toFixed(6) in the last digit on exact ties); never "-0.000000"; "nan" when not finite.
 */
export function formatFixed6(v: number): string {
  if (!(v - v === 0)) return "nan";
  let q = Math.round(Math.abs(v) * 1e6);
  if (q === 0) return "0.000000";
  const ip = Math.floor(q / 1e6);
  q -= ip * 1e6;
  return (v < 0 ? "-" : "") + ip + "." + String(q + 1000000).slice(1);
}

/** As formatFixed6 for a longitude in [0, 360): a value that rounds to 360.000000 prints as 0.000000. */
export function formatLongitude6(v: number): string {
  const s = formatFixed6(v);
  return s === "360.000000" ? "0.000000" : s;
}

/**
 * Writes formatFixed6(v) (formatLongitude6 when longitude) as ASCII into b at n and returns the
 * end index, with int32 arithmetic, two digits at a time; for |v| < 2000 or not finite
 * ("nan"), at most 12 bytes. Used by convert's writer; exported for its tests.
 */
export function writeFixed6(b: Uint8Array, n: number, v: number, longitude: boolean): number {
  if (!(v - v === 0)) { b[n++] = 110; b[n++] = 97; b[n++] = 110; return n; }
  const a = v < 0 ? -v : v;
  if (!(a < 2000)) throw new RangeError("writeFixed6: |v| must be < 2000");
  // q < 2e9 fits an int32, so the divisions below are integer divisions by constants
  let q = Math.round(a * 1e6) | 0;
  if (longitude && q === 360000000) q = 0;
  if (q !== 0 && v < 0) b[n++] = 45;
  let ip = (q / 1000000) | 0;
  const frac = (q - ip * 1000000) | 0;
  const P = DIGIT_PAIRS;
  if (ip >= 100) {
    const hi = (ip / 100) | 0;
    ip -= hi * 100;
    if (hi >= 10) { b[n++] = P[2 * hi]; b[n++] = P[2 * hi + 1]; } else b[n++] = 48 + hi;
    b[n++] = P[2 * ip]; b[n++] = P[2 * ip + 1];
  } else if (ip >= 10) { b[n++] = P[2 * ip]; b[n++] = P[2 * ip + 1]; }
  else b[n++] = 48 + ip;
  b[n++] = 46;
  const f1 = (frac / 10000) | 0, r = frac - f1 * 10000, f2 = (r / 100) | 0, f3 = r - f2 * 100;
  b[n] = P[2 * f1]; b[n + 1] = P[2 * f1 + 1]; b[n + 2] = P[2 * f2]; b[n + 3] = P[2 * f2 + 1]; b[n + 4] = P[2 * f3]; b[n + 5] = P[2 * f3 + 1];
  return n + 6;
}

/**
 * Writes ASCII/UTF-8 output into a reusable byte buffer and hands ~1 MiB pieces to a stream,
 * waiting for 'drain' when asked: no string is built per row.
 */
class ByteWriter {
  private buf = new Uint8Array(FLUSH_BYTES + 65536);
  length = 0;
  private readonly encoder = new TextEncoder();
  constructor(private readonly stream: NodeJS.WritableStream) {}

  /** Makes room for n more bytes. */
  reserve(n: number): void {
    if (this.length + n <= this.buf.length) return;
    const b = new Uint8Array(Math.max(this.buf.length * 2, this.length + n));
    b.set(this.buf.subarray(0, this.length));
    this.buf = b;
  }

  byte(c: number): void { this.buf[this.length++] = c; }

  /**
   * Copies an ASCII field that needs no CSV quoting; returns false (writing nothing) when the
   * text has a comma, quote, line break or a non-ASCII character.
   */
  plainField(s: string): boolean {
    const b = this.buf;
    const n0 = this.length;
    for (let i = 0; i < s.length; i++) {
      const c = s.charCodeAt(i);
      if (c === 44 || c === 34 || c === 10 || c === 13 || c >= 128) return false;
      b[n0 + i] = c;
    }
    this.length = n0 + s.length;
    return true;
  }

  /** As plainField for ASCII bytes src[a, e); false (writing nothing) when they need quoting. */
  plainBytes(src: Uint8Array, a: number, e: number): boolean {
    const b = this.buf;
    let n = this.length;
    for (let i = a; i < e; i++) {
      const c = src[i];
      if (c === 44 || c === 34 || c === 10 || c === 13 || c >= 128) return false;
      b[n++] = c;
    }
    this.length = n;
    return true;
  }

  ascii(s: string): void { this.reserve(s.length); for (let i = 0; i < s.length; i++) this.buf[this.length++] = s.charCodeAt(i); }

  /** Any text (UTF-8); fast path for ASCII. Caller reserves 3 bytes per UTF-16 unit. */
  text(s: string): void {
    const b = this.buf;
    let n = this.length;
    for (let i = 0; i < s.length; i++) {
      const c = s.charCodeAt(i);
      if (c >= 128) { this.length = n; this.reserve(3 * s.length); n += this.encoder.encodeInto(s.slice(i), this.buf.subarray(n)).written; this.length = n; return; }
      b[n++] = c;
    }
    this.length = n;
  }

  /**
   * A finite number with exactly 6 decimals, digits written directly (same rounding as
   * formatFixed6); longitude = true prints a value rounding to 360.000000 as 0.000000.
   */
  fixed6(v: number, longitude: boolean): void {
    const a = v < 0 ? -v : v;
    if (a >= 2000) { this.ascii(v - v === 0 ? formatFixed6(v) : "nan"); return; }
    this.length = writeFixed6(this.buf, this.length, v, longitude);
  }

  /** Writes out the buffered bytes (a copy, so the buffer can be reused at once). */
  async flush(): Promise<void> {
    if (this.length === 0) return;
    const chunk = Buffer.from(this.buf.subarray(0, this.length));
    this.length = 0;
    if (!this.stream.write(chunk)) {
      await new Promise<void>((resolve, reject) => {
        const onDrain = () => { cleanup(); resolve(); };
        const onError = (e: Error) => { cleanup(); reject(e); };
        const cleanup = () => { this.stream.off("drain", onDrain); this.stream.off("error", onError); };
        this.stream.once("drain", onDrain);
        this.stream.once("error", onError);
      });
    }
  }

  /** Resolves once everything written has been handed to the OS. */
  async end(): Promise<void> {
    await new Promise<void>((resolve) => this.stream.write("", () => resolve()));
  }
}

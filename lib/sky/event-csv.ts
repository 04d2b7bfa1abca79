/**
 * Streaming parser of the canonical event CSV (METHODS section 1) into columnar typed arrays.
 *
 * Header `id,time,zenith,azimuth,energy`, names matched case-insensitively (after trimming);
 * `time`, `zenith`, `azimuth` are required, `id` and `energy` optional; other columns are
 * ignored or kept as strings (`extraColumns: "keep"`), never reinterpreted. Fields follow
 * RFC 4180 (quoted fields with "" escapes and embedded commas or line breaks); a UTF-8 BOM and
 * CRLF line ends are accepted; blank lines are skipped.
 *
 * Values: time as ISO 8601 UTC / Unix seconds / GPS seconds (lib/sky/time.ts) -> Unix ms;
 * zenith deg in [0, 90); azimuth deg, finite, converted to north-clockwise in [0, 360);
 * energy in EeV (empty = unknown = NaN; negative is bad), or eV, or log10(E/eV).
 * Bad rows are reported with their physical line number (the header is line 1; a quoted
 * record spanning lines is reported at its first line): the first 100 plus the total. By
 * default a file with any bad row is rejected whole; `badRows: "drop"` drops them and counts.
 *
 * Use: `const p = new EventCsvParser(opts); p.feed(chunk)...; const result = p.end();`
 * or `parseEventCsv(text, opts)`. Pure: no I/O.
 */
import { type TimeFormat, parseIsoUtcRange, unixMsFromGpsSeconds } from "./time";
import type { AzimuthConvention } from "./coordinates";

/** Outcomes of the row checks (EventCsvParser checkNumbers). */
const ROW_OK = 0, ROW_BAD_TIME = 1, ROW_BAD_ZENITH = 2, ROW_BAD_AZIMUTH = 3, ROW_BAD_ENERGY = 4, ROW_NEGATIVE_ENERGY = 5;

/** Units of the energy column. */
export type EnergyUnit = "EeV" | "eV" | "log10eV";
/** The canonical columns. */
export type CanonicalColumn = "id" | "time" | "zenith" | "azimuth" | "energy";

/** Parser options; every field optional. */
export interface EventCsvOptions {
  /** Default "iso". */
  timeFormat?: TimeFormat;
  /** Convention of the azimuth column; output is always north-clockwise. Default "north-clockwise". */
  azimuthConvention?: AzimuthConvention;
  /** Default "EeV". */
  energyUnit?: EnergyUnit;
  /** "reject" (default): any bad row rejects the file; "drop": bad rows are dropped and counted. */
  badRows?: "reject" | "drop";
  /** "ignore" (default) or "keep" extra columns as strings. */
  extraColumns?: "ignore" | "keep";
  /** Header names to use for canonical columns (case-insensitive), e.g. { time: "gps_s" }. */
  columns?: Partial<Record<CanonicalColumn, string>>;
  /** How many bad rows to report in detail (default 100). */
  maxReportedBadRows?: number;
  /**
   * Size of the whole input in bytes, when known (e.g. the file size): lets the byte path size
   * its columns once from the mean row length instead of doubling them. Results do not depend on it.
   */
  sizeHintBytes?: number;
}

/** A reported bad row. */
export interface BadRow {
  /** 1-based physical line number in the file (header = 1). */
  line: number;
  reason: string;
}

/** Parsed events, one element per accepted row. */
export interface EventTable {
  n: number;
  /**
   * Event ids; when the file has no id column, the 1-based data row number as a string. When
   * `idBytes` is set, this is decoded from it on first read (then kept; assignable).
   */
  ids: string[];
  /**
   * The ids as UTF-8 bytes, when they were read from bytes (feedBytes) and never needed as text:
   * id i is bytes[ends[i - 1], ends[i]) (from 0 for i = 0), blanks trimmed, no quotes or commas
   * inside; `ascii` = every byte < 128. For writers that copy ids without making strings.
   */
  idBytes?: { bytes: Uint8Array; ends: Int32Array; ascii: boolean };
  idsGenerated: boolean;
  /** Arrival time, Unix ms UTC (POSIX). */
  unixMs: Float64Array;
  /** Zenith of the arrival direction, degrees in [0, 90). */
  zenithDeg: Float64Array;
  /** Azimuth of the arrival direction, north-clockwise degrees in [0, 360). */
  azimuthDeg: Float64Array;
  /** Energy in EeV; NaN = unknown (or no energy column). */
  energyEeV: Float64Array;
  /** 1-based physical line number of each accepted row. */
  lineNumber: Int32Array;
  /** Names (as in the header) of columns not among the canonical ones. */
  extraColumnNames: string[];
  /** Values of the extra columns when kept, by header name. */
  extra: Record<string, string[]>;
}

/** Result of a parse: the table, or the reasons it was rejected. */
export type EventCsvResult =
  | { ok: true; table: EventTable; droppedRows: number; badRowCount: number; badRows: BadRow[] }
  | { ok: false; table: null; droppedRows: 0; badRowCount: number; badRows: BadRow[]; headerError?: string };

const Role = { Ignore: 0, Id: 1, Time: 2, Zenith: 3, Azimuth: 4, Energy: 5, Extra: 6 } as const;
type Role = (typeof Role)[keyof typeof Role];

const POW10 = [1, 1e1, 1e2, 1e3, 1e4, 1e5, 1e6, 1e7, 1e8, 1e9, 1e10, 1e11, 1e12, 1e13, 1e14, 1e15, 1e16, 1e17, 1e18, 1e19, 1e20, 1e21, 1e22];

/**
 * Parses a decimal number in s[a, b) (blanks trimmed): [+-]digits[.digits][(e|E)[+-]digits].
 * Exact (correctly rounded) fast path for up to 15 significant digits and |exponent| <= 22
 * (Clinger 1990), else Number(). NaN for an empty or malformed field.
 */
export function parseDecimalRange(s: string, a: number, b: number): number {
  if (a >= b) return NaN;
  if (s.charCodeAt(a) <= 32 || s.charCodeAt(b - 1) <= 32) {
    while (a < b && s.charCodeAt(a) <= 32) a++;
    while (b > a && s.charCodeAt(b - 1) <= 32) b--;
    if (a >= b) return NaN;
  }
  let i = a;
  let neg = false;
  let c = s.charCodeAt(i);
  if (c === 45 || c === 43) { neg = c === 45; i++; }
  let mant = 0, nDigits = 0, fracDigits = 0, seenDigit = false, seenDot = false;
  for (; i < b; i++) {
    c = s.charCodeAt(i);
    const d = c - 48;
    if (d >= 0 && d <= 9) {
      seenDigit = true;
      if (mant === 0 && d === 0) { if (seenDot) fracDigits++; continue; } // leading zeros
      mant = mant * 10 + d; nDigits++;
      if (seenDot) fracDigits++;
    } else if (c === 46 && !seenDot) seenDot = true;
    else break;
  }
  if (!seenDigit) return NaN;
  let exp = 0;
  if (i < b) {
    if (c !== 101 && c !== 69) return NaN;
    i++;
    let eneg = false;
    c = s.charCodeAt(i);
    if (c === 45 || c === 43) { eneg = c === 45; i++; }
    let ed = 0;
    for (; i < b; i++) {
      const d = s.charCodeAt(i) - 48;
      if (d < 0 || d > 9) return NaN;
      exp = exp * 10 + d; ed++;
      if (exp > 100000) exp = 100000;
    }
    if (ed === 0) return NaN;
    if (eneg) exp = -exp;
  }
  if (nDigits > 15) return Number(s.slice(a, b));
  const e = exp - fracDigits;
  let v: number;
  if (mant === 0) v = 0;
  else if (e === 0) v = mant;
  else if (e > 0 && e <= 22) v = mant * POW10[e];
  else if (e < 0 && e >= -22) v = mant / POW10[-e];
  else return Number(s.slice(a, b));
  return neg ? -v : v;
}

/** Streaming event-CSV parser. feed() text chunks in order (any split), then end() once. */
export class EventCsvParser {
  private readonly timeFormat: TimeFormat;
  private readonly eastCcw: boolean;
  private readonly energyUnit: EnergyUnit;
  private readonly drop: boolean;
  private readonly keepExtra: boolean;
  private readonly maxReported: number;
  private readonly columnNames: Record<CanonicalColumn, string>;

  private rest = "";
  private started = false;
  private headerDone = false;
  private ended = false;
  private line = 0; // physical lines fully consumed so far
  private roles: Role[] = [];
  private header: string[] = [];
  private nCols = 0;
  private headerError: string | undefined;

  private n = 0;
  private dataRows = 0;
  private readonly ids: string[] = [];
  private extra: Record<string, string[]> = {};
  private extraIndex: number[] = [];
  private hasId = false;
  private badCount = 0;
  private readonly bad: BadRow[] = [];

  // per-row scratch: field boundaries
  private starts = new Int32Array(64);
  private ends = new Int32Array(64);

  constructor(options: EventCsvOptions = {}) {
    this.timeFormat = options.timeFormat ?? "iso";
    if (!["iso", "unix", "gps"].includes(this.timeFormat)) throw new RangeError(`unknown time format: ${String(this.timeFormat)}`);
    const conv = options.azimuthConvention ?? "north-clockwise";
    if (conv !== "north-clockwise" && conv !== "east-counterclockwise") throw new RangeError(`unknown azimuth convention: ${String(conv)}`);
    this.eastCcw = conv === "east-counterclockwise";
    this.energyUnit = options.energyUnit ?? "EeV";
    if (!["EeV", "eV", "log10eV"].includes(this.energyUnit)) throw new RangeError(`unknown energy unit: ${String(this.energyUnit)}`);
    this.drop = (options.badRows ?? "reject") === "drop";
    this.keepExtra = options.extraColumns === "keep";
    this.maxReported = options.maxReportedBadRows ?? 100;
    this.sizeHint = options.sizeHintBytes !== undefined && options.sizeHintBytes > 0 ? options.sizeHintBytes : 0;
    const c = options.columns ?? {};
    this.columnNames = {
      id: (c.id ?? "id").trim().toLowerCase(), time: (c.time ?? "time").trim().toLowerCase(),
      zenith: (c.zenith ?? "zenith").trim().toLowerCase(), azimuth: (c.azimuth ?? "azimuth").trim().toLowerCase(),
      energy: (c.energy ?? "energy").trim().toLowerCase(),
    };
  }

  /** Feeds the next chunk of text (chunks may split lines, fields or quotes anywhere). */
  feed(chunk: string): void {
    if (this.ended) throw new Error("EventCsvParser: feed() after end()");
    if (this.bytesFed) throw new Error("EventCsvParser: do not mix feed() and feedBytes()");
    this.textFed = true;
    this.feedText(chunk);
  }

  private feedText(chunk: string): void {
    if (!this.started) {
      if (chunk.length === 0) return;
      this.started = true;
      if (chunk.charCodeAt(0) === 0xfeff) chunk = chunk.slice(1);
    }
    const buf = this.rest.length ? this.rest + chunk : chunk;
    const used = this.process(buf, false);
    this.rest = used < buf.length ? buf.slice(used) : "";
  }

  /**
   * Feeds the next chunk of UTF-8 bytes (chunks may split anywhere, even inside a character).
   * Plain ASCII lines without quotes are parsed straight from the bytes (the fast path); from
   * the first quote or non-ASCII byte on, the rest is decoded and parsed as text. Do not mix
   * with feed() on one parser.
   */
  feedBytes(chunk: Uint8Array): void {
    if (this.ended) throw new Error("EventCsvParser: feedBytes() after end()");
    if (this.textFed) throw new Error("EventCsvParser: do not mix feed() and feedBytes()");
    this.bytesFed = true;
    if (this.decoder) { this.feedText(this.decoder.decode(chunk, { stream: true })); return; }
    // a plain Uint8Array view (not a subclass such as Node's Buffer) keeps the hot loops monomorphic
    let b = chunk.constructor === Uint8Array ? chunk : new Uint8Array(chunk.buffer, chunk.byteOffset, chunk.byteLength);
    if (this.pending.length && this.started) {
      // the cut-off line: join it with this chunk's first line only (no copy of the whole chunk)
      let nl = -1;
      for (let i = 0; i < b.length; i++) if (b[i] === 10) { nl = i; break; }
      if (nl >= 0 && nl + 1 < b.length) {
        const head = new Uint8Array(this.pending.length + nl + 1);
        head.set(this.pending); head.set(b.subarray(0, nl + 1), this.pending.length);
        this.pending = EMPTY_BYTES;
        const used = this.processBytes(head, 0, false);
        const dec = this.decoder as TextDecoder | null; // processBytes may have switched to text
        if (dec) { this.feedText(dec.decode(b.subarray(nl + 1), { stream: true })); return; }
        if (used < head.length) { // not expected (head ends with a LF): keep the plain join
          const all = new Uint8Array(head.length - used + b.length - nl - 1);
          all.set(head.subarray(used)); all.set(b.subarray(nl + 1), head.length - used);
          b = all;
        } else b = b.subarray(nl + 1);
      } else {
        const all = new Uint8Array(this.pending.length + b.length);
        all.set(this.pending); all.set(b, this.pending.length);
        b = all;
        this.pending = EMPTY_BYTES;
      }
    } else if (this.pending.length) {
      const all = new Uint8Array(this.pending.length + b.length);
      all.set(this.pending); all.set(b, this.pending.length);
      b = all;
    }
    let pos = 0;
    if (!this.started) {
      if (b.length === 0) return;
      if (b.length < 3 && b[0] === 0xef) { this.pending = b.slice(); return; }
      this.started = true;
      if (b[0] === 0xef && b[1] === 0xbb && b[2] === 0xbf) pos = 3;
    }
    const used = this.processBytes(b, pos, false);
    this.pending = used < b.length ? b.slice(used) : EMPTY_BYTES;
  }

  private textFed = false;
  private bytesFed = false;
  private pending: Uint8Array = EMPTY_BYTES;
  private decoder: TextDecoder | null = null;

  /** Finishes the parse and returns the table or the rejection. */
  end(): EventCsvResult {
    if (this.ended) throw new Error("EventCsvParser: end() called twice");
    if (this.bytesFed) {
      if (this.decoder) { const tail = this.decoder.decode(); if (tail) this.feedText(tail); }
      else if (this.pending.length) {
        const used = this.processBytes(this.pending, 0, true);
        if (used < this.pending.length) this.feedText(new TextDecoder().decode(this.pending.subarray(used)));
      }
      this.pending = EMPTY_BYTES;
    }
    if (this.rest.length) this.process(this.rest, true);
    this.rest = "";
    // ids read from bytes stay bytes, decoded on first use of table.ids (see EventTable.idBytes)
    const lazyIds = this.hasId && this.ids.length === 0 && this.idCount === this.n && this.n > 0;
    if (!lazyIds) this.flushIdBytes();
    this.ended = true;
    if (!this.headerDone && !this.headerError) this.headerError = "the file is empty (no header line)";
    if (this.headerError) {
      return { ok: false, table: null, droppedRows: 0, badRowCount: 1, badRows: [{ line: 1, reason: this.headerError }], headerError: this.headerError };
    }
    if (this.badCount > 0 && !this.drop) {
      return { ok: false, table: null, droppedRows: 0, badRowCount: this.badCount, badRows: this.bad.slice() };
    }
    const n = this.n;
    let ids = this.ids;
    if (!this.hasId) { ids = new Array<string>(n); for (let i = 0; i < n; i++) ids[i] = String(this.rowArr[i]); }
    let idBytes: EventTable["idBytes"];
    if (lazyIds) {
      idBytes = { bytes: this.idBytes.slice(0, this.idBytesLength), ends: this.idEnds.slice(0, n), ascii: !this.idsNonAscii };
      this.idBytes = EMPTY_BYTES; this.idEnds = new Int32Array(0); this.idCount = 0; this.idBytesLength = 0;
    }
    const table: EventTable = {
      n, ids, idsGenerated: !this.hasId,
      unixMs: this.tArr.slice(0, n), zenithDeg: this.zArr.slice(0, n), azimuthDeg: this.aArr.slice(0, n), energyEeV: this.eArr.slice(0, n),
      lineNumber: this.lineArr.slice(0, n),
      extraColumnNames: this.extraIndex.map((k) => this.header[k]),
      extra: this.keepExtra ? this.extra : {},
    };
    if (idBytes) {
      const store = idBytes;
      let decoded: string[] | null = null;
      table.idBytes = store;
      Object.defineProperty(table, "ids", {
        enumerable: true, configurable: true,
        get: () => (decoded ??= decodeIdBytes(store.bytes, store.ends, store.ascii)),
        set: (v: string[]) => { decoded = v; },
      });
    }
    return { ok: true, table, droppedRows: this.badCount, badRowCount: this.badCount, badRows: this.bad.slice() };
  }

  /** Processes complete records in buf; returns the index of the first unconsumed character. */
  private process(buf: string, final: boolean): number {
    const len = buf.length;
    let pos = 0;
    let nextQuote = buf.indexOf('"');
    if (nextQuote < 0) nextQuote = len;
    while (pos < len) {
      let nl = buf.indexOf("\n", pos);
      if (nl < 0) { if (!final) break; nl = len; }
      if (nextQuote < pos) { nextQuote = buf.indexOf('"', pos); if (nextQuote < 0) nextQuote = len; }
      if (nextQuote < nl) {
        // quoted record: RFC 4180 slow path (may span several physical lines)
        const rec = this.parseQuotedRecord(buf, pos, final);
        if (rec === null) break; // needs more text
        const startLine = this.line + 1;
        this.line += rec.newlines;
        this.handleFields(rec.joined, rec.starts, rec.ends, rec.count, startLine);
        pos = rec.next;
        continue;
      }
      let end = nl;
      if (end > pos && buf.charCodeAt(end - 1) === 13) end--;
      this.line++;
      // fast path: split on commas
      let count = this.splitLine(buf, pos, end);
      while (count < 0) { this.starts = new Int32Array(this.starts.length * 2); this.ends = new Int32Array(this.ends.length * 2); count = this.splitLine(buf, pos, end); }
      this.handleFields(buf, this.starts, this.ends, count, this.line);
      pos = nl + 1;
    }
    return Math.min(pos, len);
  }

  /**
   * Byte fast path over complete lines of b from pos; returns the first unconsumed index. The
   * header line, and everything from the first line holding a quote or a non-ASCII byte, go to
   * the text path (then in decoder mode for the rest of the input).
   */
  private processBytes(b: Uint8Array, pos: number, final: boolean): number {
    const len = b.length;
    let nextQuote = -1; // index of the next quote at or after pos, found only when needed
    while (pos < len) {
      if (this.headerDone && this.fastRows && (this.badCount === 0 || this.drop)) {
        // the common case: one pass over an unquoted line, values parsed as the fields are found
        const next = this.fastRow(b, pos, len, final);
        if (next >= 0) { pos = next; continue; }
        if (next === FAST_INCOMPLETE) return pos; // wait for more bytes
      }
      if (nextQuote < pos) { nextQuote = b.indexOf(34, pos); if (nextQuote < 0) nextQuote = len; }
      if (!this.headerDone) {
        let nl = b.indexOf(10, pos);
        if (nl < 0) { if (!final) break; nl = len; }
        if (nextQuote >= nl) {
          // the header: through the text path (names, roles, errors)
          let end = nl;
          if (end > pos && b[end - 1] === 13) end--;
          this.process(utf8(b, pos, end) + "\n", false);
          pos = nl + 1;
          continue;
        }
      }
      // one pass: field boundaries up to the end of the line
      let starts = this.starts, ends = this.ends;
      let count = 0, a = pos, i = pos, nl = -1;
      for (;;) {
        let c = 0;
        while (i < len) { c = b[i]; if (c === 44 || c === 10) break; i++; }
        if (i >= len) {
          if (!final) return pos; // incomplete line: wait for more bytes
          nl = len;
        } else if (c === 10) nl = i;
        if (count >= starts.length) { this.growScratch(); starts = this.starts; ends = this.ends; }
        starts[count] = a;
        if (nl >= 0) { ends[count] = nl > a && b[nl - 1] === 13 ? nl - 1 : nl; count++; break; }
        ends[count] = i; count++;
        i++; a = i;
      }
      if (nextQuote < nl) {
        // a quoted field: switch to text for the rest of the input
        this.switchToText();
        this.decoder = new TextDecoder("utf-8");
        this.feedText(this.decoder.decode(b.subarray(pos), { stream: !final }));
        return len;
      }
      this.line++;
      this.handleBytes(b, starts, ends, count, this.line);
      pos = nl + 1;
    }
    return Math.min(pos, len);
  }

  /** Set by readHeader: rows may take fastRow (no kept extra columns). */
  private fastRows = false;
  /** Role of each column (Role values), for fastRow. */
  private colRoles = new Int8Array(0);
  /**
   * One data line from b[pos] in a single pass: finds the fields and the line end and parses the
   * values in the same loop. Returns the index after the line's LF (or len at the end of the
   * input), FAST_INCOMPLETE when the line is cut off by the end of the chunk, and FAST_FALLBACK,
   * having changed nothing, whenever the line is not plainly valid (a quote, blank line, wrong
   * column count, blanks around numbers, exponents, more than 15 significant digits, a
   * non-canonical ISO form, an out-of-range value...): the general path (handleBytes) then takes
   * the line, so values, checks and messages are exactly its own.
   */
  private fastRow(b: Uint8Array, pos: number, len: number, final: boolean): number {
    const roles = this.colRoles;
    const last = roles.length - 1;
    const n = this.n;
    if (n >= this.cap) this.grow();
    // values go straight into row n of the columns (doubles never boxed); this.n only moves on success
    const tArr = this.tArr, zArr = this.zArr, aArr = this.aArr, eArr = this.eArr;
    eArr[n] = NaN;
    let i = pos, ia = 0, ib = 0;
    for (let k = 0; ; k++) {
      const role = roles[k];
      if (role === Role.Zenith) i = fastNumberInto(b, i, len, zArr, n);
      else if (role === Role.Azimuth) i = fastNumberInto(b, i, len, aArr, n);
      else if (role === Role.Time) {
        if (this.timeIso) {
          if (i + 24 > len || !isoCanonicalBytesInto(b, i, tArr, n)) return i + 24 > len && !final ? FAST_INCOMPLETE : FAST_FALLBACK;
          i += 24;
        } else {
          i = fastNumberInto(b, i, len, tArr, n);
          if (i >= 0) {
            const v = tArr[n];
            const t = this.timeFormat === "unix" ? v * 1000 : unixMsFromGpsSeconds(v);
            if (!(t - t === 0)) return FAST_FALLBACK;
            tArr[n] = t;
          }
        }
      } else if (role === Role.Energy) {
        const c = i < len ? b[i] : 10;
        if (c !== 44 && c !== 10 && c !== 13) { // else empty: unknown (NaN)
          i = fastNumberInto(b, i, len, eArr, n);
          if (i >= 0) {
            const v = eArr[n];
            if (this.energyUnit === "log10eV") eArr[n] = Math.pow(10, v - 18);
            else if (v < 0) return FAST_FALLBACK;
            else if (this.energyUnit === "eV") eArr[n] = v / 1e18;
          }
        }
      } else {
        const a0 = i;
        while (i < len) { const c = b[i]; if (c === 44 || c === 10 || c === 13 || c === 34) break; i++; }
        if (role === Role.Id) {
          ia = a0; ib = i;
          while (ia < ib && b[ia] <= 32) ia++;
          while (ib > ia && b[ib - 1] <= 32) ib--;
        }
      }
      if (i < 0) return FAST_FALLBACK;
      // the field's terminator
      if (i >= len) { if (!final) return FAST_INCOMPLETE; if (k !== last) return FAST_FALLBACK; break; }
      const c = b[i];
      if (c === 44) { if (k === last) return FAST_FALLBACK; i++; continue; }
      if (c === 13) { if (i + 1 >= len) return final ? FAST_FALLBACK : FAST_INCOMPLETE; if (b[i + 1] !== 10) return FAST_FALLBACK; i++; }
      else if (c !== 10) return FAST_FALLBACK;
      if (k !== last) return FAST_FALLBACK;
      i++; // past the LF
      break;
    }
    const z = zArr[n];
    if (!(z >= 0 && z < 90)) return FAST_FALLBACK;
    let az = aArr[n];
    if (this.eastCcw) az = 90 - az;
    if (az < 0 || az >= 360) { az %= 360; if (az < 0) az += 360; if (az >= 360) az = 0; }
    aArr[n] = az + 0;
    const line = ++this.line;
    this.dataRows++;
    this.lineArr[n] = line;
    if (this.hasId) this.pushIdBytes(b, ia, ib); else this.rowArr[n] = this.dataRows;
    this.n = n + 1;
    this.fastRowBytes += i - pos;
    return i;
  }

  /** Ids gathered as bytes (byte path): all bytes, and the end offset of each id. */
  private idBytes = new Uint8Array(0);
  private idBytesLength = 0;
  private idEnds = new Int32Array(0);
  private idCount = 0;
  private idsNonAscii = false;

  private pushIdBytes(b: Uint8Array, a: number, e: number): void {
    const n = e - a;
    if (this.idBytesLength + n > this.idBytes.length) {
      const d = new Uint8Array(Math.max(1 << 16, 2 * (this.idBytesLength + n)));
      d.set(this.idBytes.subarray(0, this.idBytesLength));
      this.idBytes = d;
    }
    const d = this.idBytes;
    let k = this.idBytesLength;
    for (let i = a; i < e; i++) { const c = b[i]; if (c >= 128) this.idsNonAscii = true; d[k++] = c; }
    this.idBytesLength = k;
    if (this.idCount >= this.idEnds.length) { const x = new Int32Array(Math.max(4096, this.idEnds.length * 2)); x.set(this.idEnds); this.idEnds = x; }
    this.idEnds[this.idCount++] = k;
  }

  /** Moves ids gathered as bytes into this.ids (decoding once) and resets the byte store. */
  private flushIdBytes(): void {
    if (this.idCount === 0) return;
    const decoded = decodeIdBytes(this.idBytes.subarray(0, this.idBytesLength), this.idEnds.subarray(0, this.idCount), !this.idsNonAscii);
    for (let i = 0; i < decoded.length; i++) this.ids.push(decoded[i]);
    this.idCount = 0; this.idBytesLength = 0; this.idsNonAscii = false;
    this.idBytes = new Uint8Array(0); this.idEnds = new Int32Array(0);
  }

  private switchToText(): void { this.flushIdBytes(); }

  private growScratch(): void {
    const s2 = new Int32Array(this.starts.length * 2), e2 = new Int32Array(this.ends.length * 2);
    s2.set(this.starts); e2.set(this.ends);
    this.starts = s2; this.ends = e2;
  }

  /** handleFields for an ASCII line held in bytes (same rules and messages). */
  private handleBytes(b: Uint8Array, starts: Int32Array, ends: Int32Array, count: number, line: number): void {
    if (count === 1 && isBlankBytes(b, starts[0], ends[0])) return;
    if (this.headerError) return;
    this.dataRows++;
    if (count !== this.nCols) {
      this.reportBad(line, `wrong column count: ${count} fields, header has ${this.nCols}`);
      return;
    }
    let fa = starts[this.timeCol], fb = ends[this.timeCol];
    let t: number;
    if (this.timeIso) {
      t = fb - fa === 24 ? parseIsoCanonicalBytes(b, fa) : NaN;
      if (!(t === t)) t = parseIsoUtcRange(latin1(b, fa, fb), 0, fb - fa);
    } else { const v = parseDecimalBytes(b, fa, fb); t = this.timeFormat === "unix" ? v * 1000 : unixMsFromGpsSeconds(v); }
    const z = parseDecimalBytes(b, starts[this.zenCol], ends[this.zenCol]);
    const aRaw = parseDecimalBytes(b, starts[this.azCol], ends[this.azCol]);
    let eRaw = NaN, eGiven = false;
    if (this.enCol >= 0) {
      fa = starts[this.enCol]; fb = ends[this.enCol];
      eGiven = !isBlankBytes(b, fa, fb);
      if (eGiven) eRaw = parseDecimalBytes(b, fa, fb);
    }
    const failed = this.checkNumbers(t, z, aRaw, eRaw, eGiven);
    if (failed !== ROW_OK) { this.reportBad(line, this.reasonText(failed, (col) => utf8(b, starts[col], ends[col]))); return; }
    const a = this.rowAzimuthDeg, e = this.rowEnergyEeV;
    if (this.badCount > 0 && !this.drop) return;
    const n = this.n;
    if (n >= this.cap) this.grow();
    this.tArr[n] = t; this.zArr[n] = z; this.aArr[n] = a; this.eArr[n] = e; this.lineArr[n] = line;
    if (this.hasId) {
      const k = this.idCol;
      let ia = starts[k], ib = ends[k];
      while (ia < ib && b[ia] <= 32) ia++;
      while (ib > ia && b[ib - 1] <= 32) ib--;
      this.pushIdBytes(b, ia, ib);
    } else this.rowArr[n] = this.dataRows;
    if (this.keepExtra) for (const k of this.extraIndex) this.extra[this.header[k]].push(utf8(b, starts[k], ends[k]));
    this.n = n + 1;
  }

  /** Splits buf[pos, end) on commas into the scratch arrays; -1 when they are too small. */
  private splitLine(buf: string, pos: number, end: number): number {
    const starts = this.starts, ends = this.ends;
    const limit = starts.length;
    let count = 0, a = pos;
    for (;;) {
      let comma = buf.indexOf(",", a);
      if (comma < 0 || comma > end) comma = end;
      if (count >= limit) return -1;
      starts[count] = a; ends[count] = comma;
      count++;
      if (comma >= end) return count;
      a = comma + 1;
    }
  }

  /** RFC 4180 record at buf[pos...]; null when it is incomplete and more text may come. */
  private parseQuotedRecord(buf: string, pos: number, final: boolean): { joined: string; starts: Int32Array; ends: Int32Array; count: number; next: number; newlines: number } | null {
    const fields: string[] = [];
    const len = buf.length;
    let i = pos, newlines = 0;
    let malformed = false;
    for (;;) {
      if (i < len && buf.charCodeAt(i) === 34) {
        // quoted field
        let v = "";
        let j = i + 1;
        for (;;) {
          const q = buf.indexOf('"', j);
          if (q < 0) { if (!final) return null; v += buf.slice(j); j = len; malformed = true; break; }
          v += buf.slice(j, q);
          if (q + 1 < len && buf.charCodeAt(q + 1) === 34) { v += '"'; j = q + 2; continue; }
          if (q + 1 >= len && !final) return null;
          j = q + 1;
          break;
        }
        for (let k = i; k < j; k++) if (buf.charCodeAt(k) === 10) newlines++;
        fields.push(v);
        i = j;
        if (i >= len) break;
        const c = buf.charCodeAt(i);
        if (c === 44) { i++; continue; }
        if (c === 10) { i++; newlines++; break; }
        if (c === 13 && i + 1 < len && buf.charCodeAt(i + 1) === 10) { i += 2; newlines++; break; }
        if (c === 13 && i + 1 >= len && !final) return null;
        // text after a closing quote: malformed; consume to end of line
        malformed = true;
        const nl = buf.indexOf("\n", i);
        if (nl < 0) { if (!final) return null; i = len; } else { i = nl + 1; newlines++; }
        break;
      } else {
        let comma = buf.indexOf(",", i);
        let nl = buf.indexOf("\n", i);
        if (nl < 0) { if (!final) return null; nl = len; }
        if (comma < 0 || comma > nl) comma = -1;
        const stop = comma >= 0 ? comma : nl;
        let fEnd = stop;
        if (comma < 0 && fEnd > i && buf.charCodeAt(fEnd - 1) === 13) fEnd--;
        const v = buf.slice(i, fEnd);
        if (v.includes('"')) malformed = true;
        fields.push(v);
        if (comma >= 0) { i = comma + 1; continue; }
        i = nl + 1;
        if (nl < len) newlines++;
        break;
      }
    }
    if (newlines === 0) newlines = 1; // the last line of the file without a line break
    if (malformed) return { joined: "", starts: new Int32Array(0), ends: new Int32Array(0), count: -1, next: i, newlines };
    const starts = new Int32Array(fields.length), ends = new Int32Array(fields.length);
    let off = 0;
    for (let k = 0; k < fields.length; k++) { starts[k] = off; off += fields[k].length; ends[k] = off; }
    return { joined: fields.join(""), starts, ends, count: fields.length, next: i, newlines };
  }

  private reportBad(line: number, reason: string): void {
    this.badCount++;
    if (this.bad.length < this.maxReported) this.bad.push({ line, reason });
  }

  /** Azimuth (north-clockwise, [0, 360)) and energy (EeV, NaN unknown) of the row last passed by checkNumbers. */
  private rowAzimuthDeg = 0;
  private rowEnergyEeV = NaN;

  /**
   * The checks of a row's numbers, shared by the text and the byte path: ROW_OK, or the first
   * field that fails (time, zenith in [0, 90), finite azimuth, finite and non-negative energy
   * when given). Sets rowAzimuthDeg (convention applied, reduced to [0, 360)) and rowEnergyEeV.
   */
  private checkNumbers(t: number, z: number, aRaw: number, eRaw: number, eGiven: boolean): number {
    if (!(t === t) || t === Infinity || t === -Infinity) return ROW_BAD_TIME;
    if (!(z >= 0 && z < 90)) return ROW_BAD_ZENITH;
    if (!(aRaw - aRaw === 0)) return ROW_BAD_AZIMUTH;
    let a = this.eastCcw ? 90 - aRaw : aRaw;
    if (a < 0 || a >= 360) { a %= 360; if (a < 0) a += 360; if (a >= 360) a = 0; }
    this.rowAzimuthDeg = a + 0;
    let e = NaN;
    if (eGiven) {
      if (!(eRaw - eRaw === 0)) return ROW_BAD_ENERGY;
      if (this.energyUnit === "log10eV") e = Math.pow(10, eRaw - 18);
      else if (eRaw < 0) return ROW_NEGATIVE_ENERGY;
      else e = this.energyUnit === "eV" ? eRaw / 1e18 : eRaw;
    }
    this.rowEnergyEeV = e;
    return ROW_OK;
  }

  /** The line's reason for a failed check, quoting the field as written (fieldText(column)). */
  private reasonText(failed: number, fieldText: (column: number) => string): string {
    switch (failed) {
      case ROW_BAD_TIME: return `unparseable time "${clip(fieldText(this.timeCol))}" (format ${this.timeFormat})`;
      case ROW_BAD_ZENITH: return `zenith outside [0, 90) deg: "${clip(fieldText(this.zenCol))}"`;
      case ROW_BAD_AZIMUTH: return `azimuth not a finite number: "${clip(fieldText(this.azCol))}"`;
      case ROW_BAD_ENERGY: return `energy not a finite number: "${clip(fieldText(this.enCol))}"`;
      default: return `negative energy: "${clip(fieldText(this.enCol))}"`;
    }
  }

  /** count = -1: malformed quoting. */
  private handleFields(s: string, starts: Int32Array, ends: Int32Array, count: number, line: number): void {
    // blank line
    if (count === 1 && isBlank(s, starts[0], ends[0])) return;
    if (!this.headerDone) { this.readHeader(s, starts, ends, count, line); return; }
    if (this.headerError) return;
    this.dataRows++;
    if (count === -1) { this.reportBad(line, "malformed quoted field (RFC 4180)"); return; }
    if (count !== this.nCols) {
      this.reportBad(line, `wrong column count: ${count} fields, header has ${this.nCols}`);
      return;
    }
    const fa = starts[this.timeCol], fb = ends[this.timeCol];
    let t: number;
    if (this.timeIso) t = parseIsoUtcRange(s, fa, fb);
    else { const v = parseDecimalRange(s, fa, fb); t = this.timeFormat === "unix" ? v * 1000 : unixMsFromGpsSeconds(v); }
    const z = parseDecimalRange(s, starts[this.zenCol], ends[this.zenCol]);
    const aRaw = parseDecimalRange(s, starts[this.azCol], ends[this.azCol]);
    let eRaw = NaN, eGiven = false;
    if (this.enCol >= 0) {
      eGiven = !isBlank(s, starts[this.enCol], ends[this.enCol]);
      if (eGiven) eRaw = parseDecimalRange(s, starts[this.enCol], ends[this.enCol]);
    }
    const failed = this.checkNumbers(t, z, aRaw, eRaw, eGiven);
    if (failed !== ROW_OK) { this.reportBad(line, this.reasonText(failed, (col) => s.slice(starts[col], ends[col]))); return; }
    const a = this.rowAzimuthDeg, e = this.rowEnergyEeV;
    if (this.badCount > 0 && !this.drop) return; // rejected anyway: stop storing
    const n = this.n;
    if (n >= this.cap) this.grow();
    this.tArr[n] = t; this.zArr[n] = z; this.aArr[n] = a; this.eArr[n] = e; this.lineArr[n] = line;
    if (this.hasId) {
      const k = this.idCol;
      let ia = starts[k], ib = ends[k];
      while (ia < ib && s.charCodeAt(ia) <= 32) ia++;
      while (ib > ia && s.charCodeAt(ib - 1) <= 32) ib--;
      this.ids.push(s.slice(ia, ib));
    } else this.rowArr[n] = this.dataRows;
    if (this.keepExtra) for (const k of this.extraIndex) this.extra[this.header[k]].push(s.slice(starts[k], ends[k]));
    this.n = n + 1;
  }

  private cap = 0;
  private tArr = new Float64Array(0);
  private zArr = new Float64Array(0);
  private aArr = new Float64Array(0);
  private eArr = new Float64Array(0);
  private lineArr = new Int32Array(0);
  private rowArr = new Int32Array(0);
  private timeCol = -1;
  private zenCol = -1;
  private azCol = -1;
  private enCol = -1;
  private get timeIso(): boolean { return this.timeFormat === "iso"; }

  private readonly sizeHint: number;
  /** Bytes of the rows taken by fastRow (for the size hint). */
  private fastRowBytes = 0;

  private grow(): void {
    let cap = Math.max(4096, this.cap * 2);
    if (this.sizeHint > 0 && this.fastRowBytes > 0 && this.n > 0) {
      // rows expected from the mean row length so far, plus 2 %
      const expected = Math.ceil((1.02 * this.sizeHint * this.n) / this.fastRowBytes) + 1024;
      if (expected > cap && expected < 2 ** 31 / 8) cap = expected;
    }
    const f = (old: Float64Array) => { const d = new Float64Array(cap); d.set(old); return d; };
    const g = (old: Int32Array) => { const d = new Int32Array(cap); d.set(old); return d; };
    this.tArr = f(this.tArr); this.zArr = f(this.zArr); this.aArr = f(this.aArr); this.eArr = f(this.eArr);
    this.lineArr = g(this.lineArr); this.rowArr = g(this.rowArr);
    this.cap = cap;
  }

  private idCol = -1;

  private readHeader(s: string, starts: Int32Array, ends: Int32Array, count: number, line: number): void {
    this.headerDone = true;
    if (count < 0) { this.headerError = `malformed quoted header field (line ${line})`; return; }
    const names: string[] = [];
    for (let k = 0; k < count; k++) names.push(s.slice(starts[k], ends[k]).trim());
    this.header = names;
    this.nCols = count;
    if (count > this.starts.length) { this.starts = new Int32Array(count + 1); this.ends = new Int32Array(count + 1); }
    const lower = names.map((x) => x.toLowerCase());
    const seen = new Map<string, number>();
    for (let k = 0; k < lower.length; k++) {
      if (seen.has(lower[k])) { this.headerError = `duplicate column "${names[k]}" in the header`; return; }
      seen.set(lower[k], k);
    }
    const roleOf = new Map<string, Role>([
      [this.columnNames.id, Role.Id], [this.columnNames.time, Role.Time], [this.columnNames.zenith, Role.Zenith],
      [this.columnNames.azimuth, Role.Azimuth], [this.columnNames.energy, Role.Energy],
    ]);
    this.roles = lower.map((x) => roleOf.get(x) ?? Role.Extra);
    const missing = (["time", "zenith", "azimuth"] as const).filter((c) => !seen.has(this.columnNames[c]));
    if (missing.length) {
      this.headerError = `missing required column${missing.length > 1 ? "s" : ""} ${missing.map((c) => `"${this.columnNames[c]}"`).join(", ")} (header: ${names.join(",")})`;
      return;
    }
    this.idCol = this.roles.indexOf(Role.Id);
    this.timeCol = this.roles.indexOf(Role.Time);
    this.zenCol = this.roles.indexOf(Role.Zenith);
    this.azCol = this.roles.indexOf(Role.Azimuth);
    this.enCol = this.roles.indexOf(Role.Energy);
    this.hasId = this.idCol >= 0;
    this.extraIndex = [];
    for (let k = 0; k < count; k++) if (this.roles[k] === Role.Extra) {
      this.extraIndex.push(k);
      if (this.keepExtra) this.extra[names[k]] = [];
    }
    if (!this.keepExtra) for (const k of this.extraIndex) this.roles[k] = Role.Ignore;
    this.colRoles = Int8Array.from(this.roles);
    this.fastRows = !this.keepExtra;
  }
}

const EMPTY_BYTES = new Uint8Array(0);
/** fastRow results other than a next position. */
const FAST_FALLBACK = -1, FAST_INCOMPLETE = -2;

/** Text of ASCII bytes b[a, e). */
function latin1(b: Uint8Array, a: number, e: number): string {
  const n = e - a;
  if (n <= 0) return "";
  if (n <= 64) return String.fromCharCode.apply(null, b.subarray(a, e) as unknown as number[]);
  let s = "";
  for (let i = a; i < e; i += 4096) s += String.fromCharCode.apply(null, b.subarray(i, Math.min(e, i + 4096)) as unknown as number[]);
  return s;
}

/** UTF-8 text of bytes b[a, e) (ASCII fast path). */
function utf8(b: Uint8Array, a: number, e: number): string {
  for (let i = a; i < e; i++) if (b[i] >= 128) return new TextDecoder("utf-8").decode(b.subarray(a, e));
  return latin1(b, a, e);
}

/**
 * Ids held as UTF-8 bytes (EventTable.idBytes: id i = bytes[ends[i - 1], ends[i]), from 0 for
 * i = 0) as strings; `ascii` true allows one decode of the whole store, sliced.
 */
export function decodeIdBytes(bytes: Uint8Array, ends: Int32Array, ascii: boolean): string[] {
  const n = ends.length;
  const out = new Array<string>(n);
  if (ascii) {
    const all = new TextDecoder("utf-8").decode(bytes.subarray(0, n > 0 ? ends[n - 1] : 0));
    let start = 0;
    for (let i = 0; i < n; i++) { out[i] = all.slice(start, ends[i]); start = ends[i]; }
  } else {
    const dec = new TextDecoder("utf-8");
    let start = 0;
    for (let i = 0; i < n; i++) { out[i] = dec.decode(bytes.subarray(start, ends[i])); start = ends[i]; }
  }
  return out;
}

function isBlankBytes(b: Uint8Array, a: number, e: number): boolean {
  for (let i = a; i < e; i++) if (b[i] > 32) return false;
  return true;
}

/** parseDecimalRange on ASCII bytes (same grammar, same exact fast path). */
export function parseDecimalBytes(s: Uint8Array, a: number, b: number): number {
  if (a >= b) return NaN;
  if (s[a] <= 32 || s[b - 1] <= 32) {
    while (a < b && s[a] <= 32) a++;
    while (b > a && s[b - 1] <= 32) b--;
    if (a >= b) return NaN;
  }
  let i = a;
  let neg = false;
  let c = s[i];
  if (c === 45 || c === 43) { neg = c === 45; i++; }
  let mant = 0, nDigits = 0, fracDigits = 0, seenDigit = false, seenDot = false;
  for (; i < b; i++) {
    c = s[i];
    const d = c - 48;
    if (d >= 0 && d <= 9) {
      seenDigit = true;
      if (mant === 0 && d === 0) { if (seenDot) fracDigits++; continue; }
      mant = mant * 10 + d; nDigits++;
      if (seenDot) fracDigits++;
    } else if (c === 46 && !seenDot) seenDot = true;
    else break;
  }
  if (!seenDigit) return NaN;
  let exp = 0;
  if (i < b) {
    if (c !== 101 && c !== 69) return NaN;
    i++;
    let eneg = false;
    c = s[i];
    if (c === 45 || c === 43) { eneg = c === 45; i++; }
    let ed = 0;
    for (; i < b; i++) {
      const d = s[i] - 48;
      if (d < 0 || d > 9) return NaN;
      exp = exp * 10 + d; ed++;
      if (exp > 100000) exp = 100000;
    }
    if (ed === 0) return NaN;
    if (eneg) exp = -exp;
  }
  if (nDigits > 15) return Number(latin1(s, a, b));
  const e = exp - fracDigits;
  let v: number;
  if (mant === 0) v = 0;
  else if (e === 0) v = mant;
  else if (e > 0 && e <= 22) v = mant * POW10[e];
  else if (e < 0 && e >= -22) v = mant / POW10[-e];
  else return Number(latin1(s, a, b));
  return neg ? -v : v;
}

/**
 * [+-]digits[.digits] at b[i...] ending at a comma, CR, LF or e (the fast row path): stores the value
 * in out[k] and returns the index just past it, with the same arithmetic as parseDecimalBytes;
 * -1 (caller falls back to the general path) for anything else.
 */
function fastNumberInto(b: Uint8Array, i: number, e: number, out: Float64Array, k: number): number {
  let neg = false;
  let c = i < e ? b[i] : 44;
  if (c === 45 || c === 43) { neg = c === 45; i++; }
  let mant = 0, nDigits = 0, fracDigits = 0, seenDigit = false, seenDot = false;
  for (; i < e; i++) {
    c = b[i];
    const d = c - 48;
    if (d >= 0 && d <= 9) {
      seenDigit = true;
      if (mant === 0 && d === 0) { if (seenDot) fracDigits++; continue; }
      mant = mant * 10 + d; nDigits++;
      if (seenDot) fracDigits++;
    } else if (c === 46 && !seenDot) seenDot = true;
    else if (c === 44 || c === 10 || c === 13) break;
    else return -1;
  }
  if (!seenDigit || nDigits > 15 || fracDigits > 22) return -1;
  const v = mant === 0 ? 0 : fracDigits === 0 ? mant : mant / POW10[fracDigits];
  out[k] = neg ? -v : v;
  return i;
}

/** parseIsoCanonicalBytes storing into out[k]; false when not canonical. */
function isoCanonicalBytesInto(b: Uint8Array, i: number, out: Float64Array, k: number): boolean {
  const t = parseIsoCanonicalBytes(b, i);
  out[k] = t;
  return t === t;
}

const DAYS_IN_MONTH_BYTES = [31, 29, 31, 30, 31, 30, 31, 31, 30, 31, 30, 31];

/**
 * Canonical ISO form YYYY-MM-DDTHH:MM:SS.sssZ in 24 bytes at b[i] -> Unix ms; NaN when not in
 * exactly that form or with a second of 60 (the caller then uses the general text parser).
 */
function parseIsoCanonicalBytes(b: Uint8Array, i: number): number {
  if (b[i + 4] !== 45 || b[i + 7] !== 45 || b[i + 10] !== 84 || b[i + 13] !== 58 || b[i + 16] !== 58 || b[i + 19] !== 46 || b[i + 23] !== 90) return NaN;
  const d0 = b[i] - 48, d1 = b[i + 1] - 48, d2 = b[i + 2] - 48, d3 = b[i + 3] - 48;
  const m0 = b[i + 5] - 48, m1 = b[i + 6] - 48, a0 = b[i + 8] - 48, a1 = b[i + 9] - 48;
  const h0 = b[i + 11] - 48, h1 = b[i + 12] - 48, n0 = b[i + 14] - 48, n1 = b[i + 15] - 48;
  const s0 = b[i + 17] - 48, s1 = b[i + 18] - 48, f0 = b[i + 20] - 48, f1 = b[i + 21] - 48, f2 = b[i + 22] - 48;
  if ((d0 >>> 0) > 9 || (d1 >>> 0) > 9 || (d2 >>> 0) > 9 || (d3 >>> 0) > 9 || (m0 >>> 0) > 9 || (m1 >>> 0) > 9 || (a0 >>> 0) > 9 || (a1 >>> 0) > 9 ||
    (h0 >>> 0) > 9 || (h1 >>> 0) > 9 || (n0 >>> 0) > 9 || (n1 >>> 0) > 9 || (s0 >>> 0) > 9 || (s1 >>> 0) > 9 || (f0 >>> 0) > 9 || (f1 >>> 0) > 9 || (f2 >>> 0) > 9) return NaN;
  const y = d0 * 1000 + d1 * 100 + d2 * 10 + d3, mo = m0 * 10 + m1, d = a0 * 10 + a1;
  const h = h0 * 10 + h1, mi = n0 * 10 + n1, sec = s0 * 10 + s1;
  if (mo < 1 || mo > 12 || d < 1 || h > 23 || mi > 59 || sec > 59) return NaN;
  if (d > DAYS_IN_MONTH_BYTES[mo - 1]) return NaN;
  if (mo === 2 && d === 29 && !((y % 4 === 0 && y % 100 !== 0) || y % 400 === 0)) return NaN;
  // days from 1970-01-01, proleptic Gregorian (Hinnant's days_from_civil)
  const yy = y - (mo <= 2 ? 1 : 0);
  const era = Math.floor(yy / 400);
  const yoe = yy - era * 400;
  const doy = Math.floor((153 * (mo + (mo > 2 ? -3 : 9)) + 2) / 5) + d - 1;
  const days = era * 146097 + yoe * 365 + Math.floor(yoe / 4) - Math.floor(yoe / 100) + doy - 719468;
  return (days * 86400 + h * 3600 + mi * 60 + sec) * 1000 + f0 * 100 + f1 * 10 + f2;
}

function isBlank(s: string, a: number, b: number): boolean {
  for (let i = a; i < b; i++) if (s.charCodeAt(i) > 32) return false;
  return true;
}

function clip(v: string): string {
  return v.length > 40 ? `${v.slice(0, 40)}...` : v;
}

/** Parses a whole CSV text at once (see EventCsvParser). */
export function parseEventCsv(text: string, options: EventCsvOptions = {}): EventCsvResult {
  const p = new EventCsvParser(options);
  p.feed(text);
  return p.end();
}

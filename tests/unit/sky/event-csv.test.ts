import { describe, expect, it } from "vitest";
import { EventCsvParser, parseDecimalRange, parseEventCsv, type EventCsvOptions } from "@/lib/sky/event-csv";
import { createRandom } from "@/lib/sky/random";
import { expectClose } from "../helpers";

function ok(text: string, options?: EventCsvOptions) {
  const r = parseEventCsv(text, options);
  if (!r.ok) throw new Error(`rejected: ${JSON.stringify(r.badRows)}`);
  return r;
}

const SAMPLE = [
  "id,time,zenith,azimuth,energy",
  "a1,2025-03-01T12:34:56.789Z,12.5,270,10.5",
  "a2,2016-12-31T23:59:60Z,0,359.999,",
  "a3,2000-01-01T00:00:00+01:00,89.999,-90,3e1",
].join("\n");

describe("event CSV parsing", () => {
  it("reads the canonical columns into typed arrays: Unix ms, zenith deg, north-clockwise azimuth deg, energy EeV", () => {
    const { table } = ok(SAMPLE);
    expect(table.n).toBe(3);
    expect(table.ids).toEqual(["a1", "a2", "a3"]);
    expect(table.unixMs[0]).toBe(Date.parse("2025-03-01T12:34:56.789Z"));
    expect(table.unixMs[1]).toBe(Date.UTC(2017, 0, 1)); // leap second -> next midnight (lib/sky/time.ts)
    expect(table.unixMs[2]).toBe(Date.UTC(1999, 11, 31, 23));
    expect(Array.from(table.zenithDeg)).toEqual([12.5, 0, 89.999]);
    expect(Array.from(table.azimuthDeg)).toEqual([270, 359.999, 270]);
    expect(table.energyEeV[0]).toBe(10.5);
    expect(table.energyEeV[1]).toBeNaN();
    expect(table.energyEeV[2]).toBe(30);
    expect(Array.from(table.lineNumber)).toEqual([2, 3, 4]);
  });

  it("parses decimals exactly like Number() (correct rounding) for 20000 random decimal strings", () => {
    const r = createRandom(12);
    for (let i = 0; i < 20000; i++) {
      const digits = 1 + Math.floor(r.next() * 15);
      let m = ""; for (let k = 0; k < digits; k++) m += Math.floor(r.next() * 10);
      const dot = Math.floor(r.next() * (digits + 1));
      let txt = `${r.next() < 0.3 ? "-" : ""}${m.slice(0, dot)}.${m.slice(dot)}`;
      if (txt.endsWith(".") || txt.startsWith(".") || txt.startsWith("-.")) txt = txt.replace(".", "");
      if (r.next() < 0.2) txt += `e${Math.floor(r.next() * 40) - 20}`;
      const v = parseDecimalRange(txt, 0, txt.length);
      if (!Object.is(v, Number(txt)) && !(v === 0 && Number(txt) === 0)) expect.fail(`${txt}: ${v} vs ${Number(txt)}`);
    }
    expect(parseDecimalRange("12345678901234567890.5", 0, 22)).toBe(12345678901234567890.5);
    expect(parseDecimalRange(" 1.5 ", 0, 5)).toBe(1.5);
    for (const bad of ["", " ", "abc", "1.2.3", "1e", "0x10", "--1", "1,5", "."]) expect(parseDecimalRange(bad, 0, bad.length)).toBeNaN();
  });

  it("matches header names case-insensitively, in any order, with extra columns ignored or kept", () => {
    const text = "Energy,AZIMUTH,site,Zenith,TIME,Id\n5,10,north,20,2020-01-01T00:00:00Z,x\n";
    const a = ok(text);
    expect(a.table.ids).toEqual(["x"]);
    expect(a.table.azimuthDeg[0]).toBe(10);
    expect(a.table.zenithDeg[0]).toBe(20);
    expect(a.table.extraColumnNames).toEqual(["site"]);
    expect(a.table.extra).toEqual({});
    const b = ok(text, { extraColumns: "keep" });
    expect(b.table.extra).toEqual({ site: ["north"] });
    const c = ok("gps_s,zen,az\n1167264018,1,2\n", { columns: { time: "GPS_S", zenith: "zen", azimuth: "az" }, timeFormat: "gps" });
    expect(c.table.unixMs[0]).toBe(Date.UTC(2017, 0, 1));
  });

  it("generates ids from the data row number when there is no id column", () => {
    const r = ok("time,zenith,azimuth\n2020-01-01T00:00:00Z,1,2\n2020-01-01T00:00:01Z,100,2\n2020-01-01T00:00:02Z,3,4\n", { badRows: "drop" });
    expect(r.table.idsGenerated).toBe(true);
    expect(r.table.ids).toEqual(["1", "3"]);
    expect(r.droppedRows).toBe(1);
  });

  it("handles a UTF-8 BOM, CRLF line ends, blank lines and RFC 4180 quoted fields (commas, quotes, line breaks)", () => {
    const text = "\uFEFFid,time,zenith,azimuth,energy\r\n\"a,1\",2020-01-01T00:00:00Z,1,2,3\r\n\r\n\"say \"\"hi\"\"\",\"2020-01-01T00:00:01Z\",\"4\",5,6\r\n\"multi\nline\",2020-01-01T00:00:02Z,7,8,9\r\nlast,2020-01-01T00:00:03Z,10,11,12";
    const { table } = ok(text);
    expect(table.ids).toEqual(["a,1", 'say "hi"', "multi\nline", "last"]);
    expect(Array.from(table.zenithDeg)).toEqual([1, 4, 7, 10]);
    expect(Array.from(table.lineNumber)).toEqual([2, 4, 5, 7]);
  });

  it("gives the same result whatever the chunking (every split point of a small file, and random chunks of a large one)", () => {
    const whole = ok(SAMPLE + "\n\"q,\"\"x\",2020-01-01T00:00:00Z,1,2,3\r\n");
    const text = SAMPLE + "\n\"q,\"\"x\",2020-01-01T00:00:00Z,1,2,3\r\n";
    for (let cut = 0; cut <= text.length; cut++) {
      for (const cut2 of [cut, Math.min(text.length, cut + 3)]) {
        const p = new EventCsvParser();
        p.feed(text.slice(0, cut)); p.feed(text.slice(cut, cut2)); p.feed(text.slice(cut2));
        const r = p.end();
        if (!r.ok) expect.fail(`cut ${cut}: rejected ${JSON.stringify(r.badRows)}`);
        expect(r.table.ids).toEqual(whole.table.ids);
        expect(Array.from(r.table.unixMs)).toEqual(Array.from(whole.table.unixMs));
        expect(Array.from(r.table.lineNumber)).toEqual(Array.from(whole.table.lineNumber));
      }
    }
    const rnd = createRandom(3);
    let big = "id,time,zenith,azimuth,energy\n";
    for (let i = 0; i < 3000; i++) big += `e${i},${new Date(Date.UTC(2020, 0, 1) + i * 1000).toISOString()},${(rnd.next() * 89).toFixed(3)},${(rnd.next() * 360).toFixed(3)},${i % 7 ? (rnd.next() * 10).toFixed(2) : ""}\n`;
    const ref = ok(big).table;
    const p = new EventCsvParser();
    let pos = 0;
    while (pos < big.length) { const k = 1 + Math.floor(rnd.next() * 200); p.feed(big.slice(pos, pos + k)); pos += k; }
    const r = p.end();
    expect(r.ok).toBe(true);
    if (r.ok) {
      expect(r.table.n).toBe(3000);
      expect(Array.from(r.table.zenithDeg)).toEqual(Array.from(ref.zenithDeg));
      expect(r.table.ids[2999]).toBe("e2999");
    }
  });

  it("converts east-counterclockwise azimuths with (90 - az) mod 360 and energies from eV and log10(E/eV)", () => {
    const text = "time,zenith,azimuth,energy\n2020-01-01T00:00:00Z,1,0,1e19\n2020-01-01T00:00:00Z,1,90,\n2020-01-01T00:00:00Z,1,180,5e18\n";
    const r = ok(text, { azimuthConvention: "east-counterclockwise", energyUnit: "eV" });
    expect(Array.from(r.table.azimuthDeg)).toEqual([90, 0, 270]);
    expectClose(r.table.energyEeV[0], 10, 1e-12); expectClose(r.table.energyEeV[2], 5, 1e-12);
    const l = ok("time,zenith,azimuth,energy\n2020-01-01T00:00:00Z,1,0,19.5\n", { energyUnit: "log10eV" });
    expectClose(l.table.energyEeV[0], Math.pow(10, 1.5), 1e-12);
  });

  it("reads Unix and GPS seconds (fractional) as time formats", () => {
    const u = ok("time,zenith,azimuth\n1483228799.25,1,2\n", { timeFormat: "unix" });
    expect(u.table.unixMs[0]).toBe(1483228799250);
    const g = ok("time,zenith,azimuth\n1167264016,1,2\n", { timeFormat: "gps" });
    expect(g.table.unixMs[0]).toBe(Date.UTC(2016, 11, 31, 23, 59, 59));
  });

  it("reports bad rows with their line numbers and reasons, rejecting the whole file by default", () => {
    const text = [
      "id,time,zenith,azimuth,energy",
      "ok,2020-01-01T00:00:00Z,10,20,1",
      "t,yesterday,10,20,1",
      "z,2020-01-01T00:00:00Z,90,20,1",
      "z2,2020-01-01T00:00:00Z,-1,20,1",
      "a,2020-01-01T00:00:00Z,10,inf,1",
      "e,2020-01-01T00:00:00Z,10,20,-3",
      "c,2020-01-01T00:00:00Z,10,20",
      "q,\"2020-01-01T00:00:00Z\"x,10,20,1",
      "ok2,2020-01-01T00:00:00Z,10,20,1",
    ].join("\n");
    const r = parseEventCsv(text);
    expect(r.ok).toBe(false);
    expect(r.table).toBeNull();
    expect(r.badRowCount).toBe(7);
    expect(r.badRows.map((b) => b.line)).toEqual([3, 4, 5, 6, 7, 8, 9]);
    expect(r.badRows[0].reason).toMatch(/time/);
    expect(r.badRows[1].reason).toMatch(/zenith/);
    expect(r.badRows[3].reason).toMatch(/azimuth/);
    expect(r.badRows[4].reason).toMatch(/negative energy/);
    expect(r.badRows[5].reason).toMatch(/column count/);
    expect(r.badRows[6].reason).toMatch(/quoted/);
    const d = parseEventCsv(text, { badRows: "drop" });
    expect(d.ok).toBe(true);
    if (d.ok) { expect(d.table.ids).toEqual(["ok", "ok2"]); expect(d.droppedRows).toBe(7); }
  });

  it("reports the first 100 bad rows plus the total count", () => {
    let text = "time,zenith,azimuth\n";
    for (let i = 0; i < 250; i++) text += "2020-01-01T00:00:00Z,95,0\n";
    const r = parseEventCsv(text);
    expect(r.ok).toBe(false);
    expect(r.badRowCount).toBe(250);
    expect(r.badRows.length).toBe(100);
    expect(r.badRows[99].line).toBe(101);
  });

  it("rejects a header without a required column, with duplicate columns, or an empty file", () => {
    const a = parseEventCsv("id,time,zenith\nx,2020-01-01T00:00:00Z,1\n");
    expect(a.ok).toBe(false);
    if (!a.ok) expect(a.headerError).toMatch(/missing required column "azimuth"/);
    const b = parseEventCsv("time,zenith,azimuth,Zenith\n");
    expect(!b.ok && b.headerError).toMatch(/duplicate/);
    const c = parseEventCsv("");
    expect(!c.ok && c.headerError).toMatch(/empty/);
    expect(() => new EventCsvParser({ timeFormat: "tai" as never })).toThrow(RangeError);
  });
});

describe("event CSV parsing from bytes (feedBytes)", () => {
  const texts = [
    SAMPLE,
    "\uFEFFid,time,zenith,azimuth,energy\r\n\"a,1\",2020-01-01T00:00:00Z,1,2,3\r\n\r\nplain,2020-01-01T00:00:01.500Z,4,5,6\r\n\"multi\nline\",2020-01-01T00:00:02Z,7,8,9\r\nlast,2020-01-01T00:00:03Z,10,11,12",
    "id,time,zenith,azimuth,energy\nok,2020-01-01T00:00:00.000Z,10,20,1\nt,yesterday,10,20,1\nz,2020-01-01T00:00:00.000Z,90,20,1\nc,2020-01-01T00:00:00.000Z,10,20\nCórdoba,2020-01-01T00:00:00.000Z,10,20,1\nok2,2016-12-31T23:59:60.500Z,10,20,1\n",
    "time,zenith,azimuth\n2020-01-01T00:00:00.000Z, 1.5 ,2\n2020-02-30T00:00:00.000Z,1,2\n2020-01-01T00:00:00.000+01:00,1,2",
    "id,time,zenith,azimuth,energy\n" + Array.from({ length: 500 }, (_, i) => `e${i},${new Date(Date.UTC(2021, 0, 1) + i * 7777).toISOString()},${(i * 0.17) % 89},${(i * 3.3) % 360},${i % 5 ? i / 7 : ""}`).join("\n") + "\n",
  ];

  it("gives exactly the results of the text path for any split of the bytes (UTF-8 characters split too)", () => {
    const enc = new TextEncoder();
    const rnd = createRandom(77);
    for (const [k, text] of texts.entries()) {
      for (const options of [{}, { badRows: "drop" as const }]) {
        const ref = parseEventCsv(text, options);
        const bytes = enc.encode(text);
        for (let trial = 0; trial < 25; trial++) {
          const p = new EventCsvParser(options);
          let pos = 0;
          while (pos < bytes.length) { const step = trial === 0 ? bytes.length : 1 + Math.floor(rnd.next() * (trial < 5 ? 3 : 300)); p.feedBytes(bytes.subarray(pos, pos + step)); pos += step; }
          const r = p.end();
          expect(r.ok, `text ${k} trial ${trial}`).toBe(ref.ok);
          expect(r.badRowCount).toBe(ref.badRowCount);
          expect(r.badRows).toEqual(ref.badRows);
          if (r.ok && ref.ok) {
            expect(r.table.ids).toEqual(ref.table.ids);
            for (const col of ["unixMs", "zenithDeg", "azimuthDeg", "energyEeV", "lineNumber"] as const) expect(Array.from(r.table[col])).toEqual(Array.from(ref.table[col]));
          }
        }
      }
    }
  });

  // lines the one-pass byte path must hand to the general path: exponents, signs, blanks, long
  // mantissas, lone CR, extra or missing fields, non-canonical ISO forms, out-of-range values
  const corners = [
    "energy,azimuth,extra,zenith,time,id\n" +
      "1e1,+20,x,1.25e0,2020-01-01T00:00:00.000Z,a\n" +
      "007.500,-0,y,0,2020-01-01T00:00:00.000Z, spaced id \n" +
      ",.5,,5.,2020-01-01T00:00:00.000Z,b\r\n" +
      "1.0000000000000002,359.99999999999999,z,89.9999999999999999,2020-01-01T00:00:00.000Z,c\n" +
      "-1,20,z,10,2020-01-01T00:00:00.000Z,neg\n" +
      "2,20,z,10,2020-01-01T00:00:00.000Z,extra,\n" +
      "2,20,z,10,2020-01-01T00:00:00.000Z\n" +
      "2,20,z,90,2020-01-01T00:00:00.000Z,z90\n" +
      "2,20,z,-0.0,2020-01-01T00:00:00.000Z,zneg0\n" +
      "2,720.25,z,10,2020-01-01T00:00:00.000Z,wrap\n" +
      "2,20,z,10,2020-01-01 00:00:00.000Z,space\n" +
      "2,20,z,10,2020-01-01T00:00:00.000z,lowz\n" +
      "2,20,z,10,2020-01-01T00:00:00.000Zjunk,junk\n" +
      "2,20,z,10,2020-01-01T00:00:00.000Z,cr\rinside\n" +
      "2,20\r,z,10,2020-01-01T00:00:00.000Z,cr2\n" +
      "2 ,20,z,10,2020-01-01T00:00:00.000Z,blank\n" +
      "\n \n" +
      "3,30,z,20,2024-02-29T23:59:59.999Z,leap\n" +
      "3,30,z,20,2023-02-29T00:00:00.000Z,noleap\n" +
      "3,30,z,20,1969-12-31T23:59:59.999Z,pre1970",
  ];

  it("takes the one-pass byte path only where it gives exactly the general path's values, checks and line numbers", () => {
    const enc = new TextEncoder();
    const rnd = createRandom(5);
    const optionSets: EventCsvOptions[] = [
      { badRows: "drop" }, {}, { badRows: "drop", azimuthConvention: "east-counterclockwise", energyUnit: "eV" },
      { badRows: "drop", energyUnit: "log10eV", sizeHintBytes: 100 },
    ];
    for (const options of optionSets) for (const text of [...corners, texts[4]]) {
      const ref = parseEventCsv(text, options); // the text path: parseDecimalRange / parseIsoUtcRange
      const bytes = enc.encode(text);
      for (let trial = 0; trial < 12; trial++) {
        const p = new EventCsvParser(options);
        let pos = 0;
        while (pos < bytes.length) { const step = trial === 0 ? bytes.length : 1 + Math.floor(rnd.next() * (trial < 6 ? 4 : 90)); p.feedBytes(bytes.subarray(pos, pos + step)); pos += step; }
        const r = p.end();
        expect(r.ok).toBe(ref.ok);
        expect(r.badRows).toEqual(ref.badRows);
        expect(r.badRowCount).toBe(ref.badRowCount);
        if (r.ok && ref.ok) {
          expect(r.table.n).toBe(ref.table.n);
          expect(r.table.ids).toEqual(ref.table.ids);
          for (const col of ["unixMs", "zenithDeg", "azimuthDeg", "energyEeV", "lineNumber"] as const) {
            const a = Array.from(r.table[col]), b = Array.from(ref.table[col]);
            expect(a).toEqual(b);
            for (let i = 0; i < a.length; i++) expect(Object.is(a[i], b[i]), `${col}[${i}] sign of zero`).toBe(true);
          }
        }
      }
    }
  });

  it("reads unix and GPS seconds on the byte path exactly as on the text path", () => {
    const enc = new TextEncoder();
    const text = "time,zenith,azimuth\n1700000000.25,10,20\n315964800,1,2\n1e9,3,4\n-5.5,6,7\n 12,8,9\n";
    for (const timeFormat of ["unix", "gps"] as const) {
      const ref = parseEventCsv(text, { timeFormat });
      const p = new EventCsvParser({ timeFormat });
      p.feedBytes(enc.encode(text));
      const r = p.end();
      expect(r.ok && ref.ok).toBe(true);
      if (r.ok && ref.ok) expect(Array.from(r.table.unixMs)).toEqual(Array.from(ref.table.unixMs));
    }
  });

  it("parses random canonical rows from bytes to the values of Date.parse (ECMA-262 sec. 21.4.3.2) and Number (sec. 7.1.4.1.1, correctly rounded)", () => {
    const rnd = createRandom(99);
    const rows: string[] = ["id,time,zenith,azimuth,energy"];
    const want: { t: number; z: number; a: number; e: number; id: string }[] = [];
    for (let i = 0; i < 3000; i++) {
      const iso = new Date(Math.floor(-2e12 + rnd.next() * 6e12)).toISOString();
      const z = (rnd.next() * 90).toFixed(1 + Math.floor(rnd.next() * 12)), a = (rnd.next() * 360).toFixed(Math.floor(rnd.next() * 10));
      const e = rnd.next() < 0.2 ? "" : (rnd.next() * 1000).toFixed(Math.floor(rnd.next() * 14));
      if (Number(z) >= 90) continue;
      const id = `ev${i}`;
      rows.push([id, iso, z, a, e].join(","));
      want.push({ t: Date.parse(iso), z: Number(z), a: Number(a) % 360, e: e === "" ? NaN : Number(e), id });
    }
    const p = new EventCsvParser({ sizeHintBytes: 1 });
    p.feedBytes(new TextEncoder().encode(rows.join("\n") + "\n"));
    const r = p.end();
    expect(r.ok).toBe(true);
    if (!r.ok) return;
    expect(r.table.n).toBe(want.length);
    expect(r.table.idBytes?.ascii).toBe(true); // ids stayed bytes until read
    for (let i = 0; i < want.length; i++) {
      expect(r.table.unixMs[i]).toBe(want[i].t);
      expect(r.table.zenithDeg[i]).toBe(want[i].z);
      expect(r.table.azimuthDeg[i]).toBe(want[i].a);
      expect(Object.is(r.table.energyEeV[i], want[i].e)).toBe(true);
    }
    expect(r.table.ids).toEqual(want.map((w) => w.id));
    expect(r.table.ids).toBe(r.table.ids); // decoded once
  });

  it("refuses to mix text and byte chunks in one parse", () => {
    const p = new EventCsvParser();
    p.feed("time,zenith,azimuth\n");
    expect(() => p.feedBytes(new Uint8Array([50]))).toThrow(/mix/);
  });
});

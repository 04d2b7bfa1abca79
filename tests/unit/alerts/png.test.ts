import { crc32 as zlibCrc32, inflateSync } from "node:zlib";
import { describe, expect, it } from "vitest";
import { crc32, encodePng } from "@/lib/mail/png";

/** Splits a PNG file into chunks (PNG specification, section 5.3: length, type, data, CRC). */
function chunks(png: Buffer) {
  const out: { type: string; data: Buffer; crc: number }[] = [];
  for (let o = 8; o < png.length; ) {
    const len = png.readUInt32BE(o);
    out.push({ type: png.toString("ascii", o + 4, o + 8), data: png.subarray(o + 8, o + 8 + len), crc: png.readUInt32BE(o + 8 + len) });
    o += 12 + len;
  }
  return out;
}

describe("the PNG encoder", () => {
  it("computes CRC-32 as zlib does (ISO 3309 polynomial), and the IEND chunk's CRC is AE426082 as in every PNG file", () => {
    for (const s of ["", "IEND", "IHDR", "123456789", "The quick brown fox"]) expect(crc32(Buffer.from(s))).toBe(zlibCrc32(Buffer.from(s)));
    // CRC-32 check value of "123456789" is CBF43926 (the catalogue of CRC parameters, CRC-32/ISO-HDLC).
    expect(crc32(Buffer.from("123456789"))).toBe(0xcbf43926);
    expect(crc32(Buffer.from("IEND"))).toBe(0xae426082);
  });

  it("writes the signature, IHDR (8-bit RGBA), IDAT and IEND, each with a valid CRC, and the pixels inflate back exactly", () => {
    const width = 3, height = 2;
    const rgba = Uint8Array.from({ length: width * height * 4 }, (_, i) => (i * 37) % 256);
    const png = encodePng(width, height, rgba);
    expect([...png.subarray(0, 8)]).toEqual([137, 80, 78, 71, 13, 10, 26, 10]);
    const cs = chunks(png);
    expect(cs.map((c) => c.type)).toEqual(["IHDR", "IDAT", "IEND"]);
    for (const c of cs) expect(c.crc).toBe(zlibCrc32(Buffer.concat([Buffer.from(c.type, "ascii"), c.data])));
    const ihdr = cs[0]!.data;
    expect([ihdr.readUInt32BE(0), ihdr.readUInt32BE(4), ihdr[8], ihdr[9], ihdr[10], ihdr[11], ihdr[12]]).toEqual([3, 2, 8, 6, 0, 0, 0]);
    const raw = inflateSync(cs[1]!.data);
    expect(raw.length).toBe(height * (1 + width * 4));
    for (let y = 0; y < height; y++) {
      expect(raw[y * (1 + width * 4)]).toBe(0); // filter type None
      expect([...raw.subarray(y * (1 + width * 4) + 1, (y + 1) * (1 + width * 4))]).toEqual([...rgba.subarray(y * width * 4, (y + 1) * width * 4)]);
    }
  });

  it("refuses a wrong number of bytes or a zero size", () => {
    expect(() => encodePng(2, 2, new Uint8Array(15))).toThrow(RangeError);
    expect(() => encodePng(0, 2, new Uint8Array(0))).toThrow(RangeError);
  });
});

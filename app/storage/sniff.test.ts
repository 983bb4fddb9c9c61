import jpeg from "jpeg-js";
import { describe, expect, it } from "vitest";
import { SNIFF_BYTES, sniffImageType } from "./sniff";

const bytes = (...values: number[]) => new Uint8Array(values);
const text = (value: string) => new TextEncoder().encode(value);
const concat = (...parts: Uint8Array[]) => {
  const out = new Uint8Array(parts.reduce((sum, part) => sum + part.length, 0));
  let offset = 0;
  for (const part of parts) {
    out.set(part, offset);
    offset += part.length;
  }
  return out;
};
const uint32be = (value: number) => bytes((value >>> 24) & 0xff, (value >>> 16) & 0xff, (value >>> 8) & 0xff, value & 0xff);

/** An ISO BMFF ftyp box: size, "ftyp", major brand, minor version 0, compatible brands. */
function ftyp(major: string, ...compatible: string[]) {
  const size = 16 + 4 * compatible.length;
  return concat(uint32be(size), text("ftyp"), text(major), uint32be(0), ...compatible.map(text));
}

describe("sniffImageType", () => {
  it("recognises JPEG by its SOI marker and the start of the next marker", () => {
    // JPEG: ITU-T T.81 Annex B, Table B.1: SOI marker X'FFD8'; every marker begins with X'FF'
    // (B.1.1.2), so a JPEG file starts FF D8 FF (clause numbers from memory).
    expect(sniffImageType(bytes(0xff, 0xd8, 0xff, 0xe0, 0x00, 0x10, 0x4a, 0x46, 0x49, 0x46))).toBe("image/jpeg");
    expect(sniffImageType(bytes(0xff, 0xd8, 0xff, 0xe1))).toBe("image/jpeg");
  });

  it("recognises a JPEG written by a real encoder", () => {
    // jpeg-js (npm) as the reference JPEG encoder.
    const file = jpeg.encode({ width: 8, height: 8, data: new Uint8Array(8 * 8 * 4).fill(200) }, 80).data;
    expect(sniffImageType(file.subarray(0, SNIFF_BYTES))).toBe("image/jpeg");
  });

  it("does not take two bytes of SOI alone for a JPEG", () => {
    // JPEG: ITU-T T.81 Annex B: SOI must be followed by another marker (FF).
    expect(sniffImageType(bytes(0xff, 0xd8))).toBeNull();
    expect(sniffImageType(bytes(0xff, 0xd8, 0x00, 0x00))).toBeNull();
  });

  it("recognises PNG by its eight-byte signature", () => {
    // PNG: W3C PNG Specification (Second Edition) §5.2 PNG signature: 137 80 78 71 13 10 26 10.
    expect(sniffImageType(concat(bytes(0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a), uint32be(13), text("IHDR")))).toBe("image/png");
  });

  it("refuses a PNG signature damaged by a text-mode transfer", () => {
    // PNG: W3C PNG Specification §5.2 gives the exact eight bytes; that the CR LF pair is there
    // to catch line-ending conversion is its stated rationale (from memory).
    expect(sniffImageType(bytes(0x89, 0x50, 0x4e, 0x47, 0x0a, 0x1a, 0x0a, 0x00))).toBeNull();
  });

  it("recognises WebP by RIFF, a size, then WEBP", () => {
    // WebP Container Specification (developers.google.com/speed/webp/docs/riff_container),
    // "WebP file header": 'RIFF', uint32 file size, 'WEBP'.
    expect(sniffImageType(concat(text("RIFF"), bytes(0x24, 0x00, 0x00, 0x00), text("WEBPVP8 ")))).toBe("image/webp");
  });

  it("refuses other RIFF files", () => {
    // WebP Container Specification: bytes 8–11 MUST be "WEBP"; a RIFF WAVE file is audio.
    expect(sniffImageType(concat(text("RIFF"), bytes(0x24, 0x00, 0x00, 0x00), text("WAVEfmt ")))).toBeNull();
  });

  it("recognises HEIC by the ftyp box's major brand", () => {
    // ISO/IEC 14496-12 (ISO BMFF) §4.3: the file starts with its ftyp box (size, 'ftyp',
    // major_brand, minor_version, compatible_brands); brands heic, heix, hevc, hevx, heim, heis
    // from ISO/IEC 23008-12 Annex B — from memory, the standard was not read for this test.
    for (const brand of ["heic", "heix", "hevc", "hevx", "heim", "heis"]) {
      expect(sniffImageType(ftyp(brand, "mif1", brand)), brand).toBe("image/heic");
    }
  });

  it("recognises a generic HEIF brand with HEVC among the compatible brands", () => {
    // ISO/IEC 23008-12: mif1 / msf1 are the generic image / sequence brands; phones write
    // "mif1" major with "heic" compatible — from memory.
    expect(sniffImageType(ftyp("mif1", "mif1", "heic"))).toBe("image/heic");
    expect(sniffImageType(ftyp("msf1", "msf1", "hevc"))).toBe("image/heic");
    expect(sniffImageType(ftyp("mif1", "mif1"))).toBe("image/heic");
  });

  it("refuses AVIF, which shares the generic HEIF brands", () => {
    // AV1 Image File Format (AVIF), AOMedia, §9.1 brands avif / avis — from memory.
    expect(sniffImageType(ftyp("avif", "mif1", "miaf", "avif"))).toBeNull();
    expect(sniffImageType(ftyp("mif1", "mif1", "miaf", "avif"))).toBeNull();
  });

  it("refuses other ISO BMFF files, such as MP4 video", () => {
    // ISO/IEC 14496-14: "isom" / "mp42" are MP4 brands — from memory.
    expect(sniffImageType(ftyp("isom", "isom", "mp42"))).toBeNull();
    expect(sniffImageType(ftyp("mp42", "mp42"))).toBeNull();
  });

  it("refuses an ftyp box whose size is impossible", () => {
    // ISO/IEC 14496-12 §4.2: a box's size counts its own header; an ftyp box is at least 16
    // bytes — from memory.
    const box = ftyp("heic");
    box.set(uint32be(8), 0);
    expect(sniffImageType(box)).toBeNull();
  });

  it("refuses text, HTML, PDF, GIF and empty input", () => {
    // common practice, no source: none of these start like an accepted photo.
    expect(sniffImageType(text("hello"))).toBeNull();
    expect(sniffImageType(text("<!doctype html><script>alert(1)</script>"))).toBeNull();
    expect(sniffImageType(text("%PDF-1.7\n"))).toBeNull();
    expect(sniffImageType(text("GIF89a"))).toBeNull();
    expect(sniffImageType(new Uint8Array(0))).toBeNull();
  });

  it("looks at the first 64 bytes only", () => {
    // common practice, no source: the server reads that many with a ranged GET.
    expect(SNIFF_BYTES).toBe(64);
    const late = concat(new Uint8Array(64), bytes(0xff, 0xd8, 0xff));
    expect(sniffImageType(late)).toBeNull();
  });
});

import { describe, expect, it } from "vitest";
import { dmsRationals, dmsToDecimal, makeJpeg, makeJpegWithExif, type Dms } from "../../tests/support/photos";
import { exifDateToWallTime, readPhotoExif } from "./exif";

const arrayBufferOf = (bytes: Buffer): ArrayBuffer => bytes.buffer.slice(bytes.byteOffset, bytes.byteOffset + bytes.byteLength) as ArrayBuffer;

/** DMS → signed decimal degrees, computed here from the definition, not by the code under test. */
const expectedDecimal = (dms: Dms) => {
  // from memory: one degree is 60 minutes, one minute 60 seconds; EXIF GPSLatitudeRef /
  // GPSLongitudeRef "S" / "W" mean south / west, which decimal degrees write as negative.
  const value = dms.degrees + dms.minutes / 60 + dms.seconds / 3600;
  return dms.ref === "S" || dms.ref === "W" ? -value : value;
};

// North-west: 43°4'30.5"N 89°24'7.2"W.
const northWest = {
  latitude: { degrees: 43, minutes: 4, seconds: 30.5, ref: "N" } as Dms,
  longitude: { degrees: 89, minutes: 24, seconds: 7.2, ref: "W" } as Dms,
};
// South-east: 33°51'24.36"S 151°12'36.72"E.
const southEast = {
  latitude: { degrees: 33, minutes: 51, seconds: 24.36, ref: "S" } as Dms,
  longitude: { degrees: 151, minutes: 12, seconds: 36.72, ref: "E" } as Dms,
};

describe("readPhotoExif", () => {
  it("reads a north-west position and the time a camera wrote", async () => {
    // piexifjs (npm) as the reference EXIF writer: GPS as three RATIONALs with N/S/E/W refs,
    // DateTimeOriginal as "YYYY:MM:DD HH:MM:SS" (EXIF 2.3 §4.6.5 / §4.6.6, from memory).
    const photo = makeJpegWithExif({ dateTimeOriginal: "2025:04:27 09:41:05", gps: northWest });
    const exif = await readPhotoExif(arrayBufferOf(photo));
    expect(exif.latitude).toBeCloseTo(expectedDecimal(northWest.latitude), 6);
    expect(exif.longitude).toBeCloseTo(expectedDecimal(northWest.longitude), 6);
    expect(exif.latitude).toBeGreaterThan(0);
    expect(exif.longitude).toBeLessThan(0);
    // Wall time as written, whatever the machine's time zone (STACK.md: EXIF has no zone).
    expect(exif.takenAt).toBe("2025-04-27T09:41");
  });

  it("reads a south-east position as negative latitude, positive longitude", async () => {
    // piexifjs (npm) as the reference EXIF writer.
    const photo = makeJpegWithExif({ dateTimeOriginal: "2024:12:31 23:59:59", gps: southEast });
    const exif = await readPhotoExif(new Blob([arrayBufferOf(photo)], { type: "image/jpeg" }));
    expect(exif.latitude).toBeCloseTo(expectedDecimal(southEast.latitude), 6);
    expect(exif.longitude).toBeCloseTo(expectedDecimal(southEast.longitude), 6);
    expect(exif.latitude).toBeLessThan(0);
    expect(exif.longitude).toBeGreaterThan(0);
    // A minute before midnight stays on its day: no time zone was applied.
    expect(exif.takenAt).toBe("2024-12-31T23:59");
  });

  it("takes what the helper wrote for signed decimal degrees back to the same place", async () => {
    // piexifjs (npm) as the reference EXIF writer; the helper rounds seconds to 1/1000, i.e.
    // under 1e-6 degrees.
    const photo = makeJpegWithExif({ gps: { latitude: -12.345678, longitude: 98.765432 } });
    const exif = await readPhotoExif(arrayBufferOf(photo));
    expect(exif.latitude).toBeCloseTo(-12.345678, 6);
    expect(exif.longitude).toBeCloseTo(98.765432, 6);
    expect(exif.takenAt).toBeNull();
  });

  it("gives nulls, without throwing, for a JPEG without EXIF", async () => {
    // jpeg-js (npm) writes no EXIF segment.
    expect(await readPhotoExif(arrayBufferOf(makeJpeg()))).toEqual({ takenAt: null, latitude: null, longitude: null });
  });

  it("gives nulls for a photo with EXIF but neither time nor place", async () => {
    // piexifjs (npm) as the reference EXIF writer: IFD0 only.
    expect(await readPhotoExif(arrayBufferOf(makeJpegWithExif({})))).toEqual({ takenAt: null, latitude: null, longitude: null });
  });

  it("gives nulls for bytes that are no image at all, and for nothing", async () => {
    // common practice, no source: the form must not break on a wrong file.
    expect(await readPhotoExif(new TextEncoder().encode("hello").buffer as ArrayBuffer)).toEqual({ takenAt: null, latitude: null, longitude: null });
    expect(await readPhotoExif(new ArrayBuffer(0))).toEqual({ takenAt: null, latitude: null, longitude: null });
    expect(await readPhotoExif(new Blob([]))).toEqual({ takenAt: null, latitude: null, longitude: null });
  });

  it("gives nulls for a JPEG cut off inside its EXIF", async () => {
    // common practice, no source: a half-transferred file.
    const photo = makeJpegWithExif({ dateTimeOriginal: "2025:04:27 09:41:05", gps: northWest });
    const exif = await readPhotoExif(arrayBufferOf(photo.subarray(0, 40)));
    expect(exif).toEqual({ takenAt: null, latitude: null, longitude: null });
  });

  it("treats 0,0 as no position", async () => {
    // common practice, no source: cameras without a fix write zeros.
    const photo = makeJpegWithExif({ dateTimeOriginal: "2025:04:27 09:41:05", gps: { latitude: 0, longitude: 0 } });
    const exif = await readPhotoExif(arrayBufferOf(photo));
    expect(exif).toEqual({ takenAt: "2025-04-27T09:41", latitude: null, longitude: null });
  });

  it("reads a photo-sized file", async () => {
    // piexifjs (npm) as the reference EXIF writer, on a 1600×1200 JPEG from jpeg-js.
    const photo = makeJpegWithExif({ width: 1600, height: 1200, pattern: "petals", dateTimeOriginal: "2025:06:01 14:05:00", gps: southEast });
    expect(photo.length).toBeGreaterThan(100_000);
    const exif = await readPhotoExif(new Blob([arrayBufferOf(photo)]));
    expect(exif.takenAt).toBe("2025-06-01T14:05");
    expect(exif.latitude).toBeCloseTo(expectedDecimal(southEast.latitude), 6);
  });
});

describe("the photo helper", () => {
  it("writes DMS as three rationals, seconds to the thousandth", () => {
    // EXIF 2.3 §4.6.6 GPSLatitude: RATIONAL × 3, degrees, minutes, seconds (from memory).
    expect(dmsRationals(northWest.latitude)).toEqual([
      [43, 1],
      [4, 1],
      [30500, 1000],
    ]);
    expect(dmsToDecimal(southEast.latitude)).toBeCloseTo(expectedDecimal(southEast.latitude), 12);
  });
});

describe("exifDateToWallTime", () => {
  it("turns the EXIF form into the form's local date-time", () => {
    // EXIF 2.3 §4.6.5 DateTimeOriginal "YYYY:MM:DD HH:MM:SS" (from memory); HTML
    // datetime-local value "YYYY-MM-DDTHH:mm" (HTML Living Standard, local date and time string).
    expect(exifDateToWallTime("2025:04:27 09:41:05")).toBe("2025-04-27T09:41");
    expect(exifDateToWallTime("2025-04-27 09:41:05")).toBe("2025-04-27T09:41");
  });

  it("refuses blanks and impossible dates", () => {
    // EXIF 2.3: unknown date and time may be written as blanks or zeros (from memory).
    expect(exifDateToWallTime("0000:00:00 00:00:00")).toBeNull();
    expect(exifDateToWallTime("    :  :     :  :  ")).toBeNull();
    expect(exifDateToWallTime("2025:02:30 10:00:00")).toBeNull();
    expect(exifDateToWallTime("2025:04:27 24:00:00")).toBeNull();
    expect(exifDateToWallTime(undefined)).toBeNull();
    expect(exifDateToWallTime(new Date())).toBeNull();
  });
});

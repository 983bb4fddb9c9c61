import jpeg from "jpeg-js";
import piexif from "piexifjs";

/**
 * Photos made from nothing, for tests and the demo seed: a JPEG drawn pixel by pixel (jpeg-js)
 * with EXIF written into it (piexifjs). No real photograph is involved. Works under Node.
 */

/** Degrees, minutes, seconds as a camera writes them, with the hemisphere letter. */
export interface Dms {
  degrees: number;
  minutes: number;
  seconds: number;
  ref: "N" | "S" | "E" | "W";
}

export interface PhotoOptions {
  width?: number;
  height?: number;
  /** "solid": one colour; "petals": a stylised flower on leaf green, for realistic file sizes. */
  pattern?: "solid" | "petals";
  /** RGB of the solid colour, or of the petals. */
  color?: [number, number, number];
  /** jpeg-js quality, 1–100. */
  quality?: number;
  /** EXIF DateTimeOriginal as written, "YYYY:MM:DD HH:MM:SS"; omitted when not given. */
  dateTimeOriginal?: string;
  /** GPS position: signed decimal degrees or explicit DMS; omitted when not given. */
  gps?: { latitude: number | Dms; longitude: number | Dms };
  /** Written into IFD0 so a file can be recognised; "Visitwort test photo" by default. */
  description?: string;
}

const LEAF_GREEN: [number, number, number] = [74, 128, 60];
const VIOLET: [number, number, number] = [140, 92, 196];
const POLLEN: [number, number, number] = [236, 196, 64];

// Seconds keep three decimals: enough for 3 cm, and exact for values such as 30.5 or 7.2.
const SECONDS_DENOMINATOR = 1000;

function toDms(value: number, axis: "latitude" | "longitude"): Dms {
  const ref = axis === "latitude" ? (value < 0 ? "S" : "N") : value < 0 ? "W" : "E";
  const absolute = Math.abs(value);
  let degrees = Math.floor(absolute);
  let minutes = Math.floor((absolute - degrees) * 60);
  let seconds = Math.round(((absolute - degrees) * 60 - minutes) * 60 * SECONDS_DENOMINATOR) / SECONDS_DENOMINATOR;
  // Rounding can carry 59.9996 s up to a whole minute.
  if (seconds >= 60) {
    seconds -= 60;
    minutes += 1;
  }
  if (minutes >= 60) {
    minutes -= 60;
    degrees += 1;
  }
  return { degrees, minutes, seconds, ref };
}

/** The three EXIF RATIONALs of a GPS coordinate. */
export function dmsRationals(dms: Dms): [number, number][] {
  return [
    [dms.degrees, 1],
    [dms.minutes, 1],
    [Math.round(dms.seconds * SECONDS_DENOMINATOR), SECONDS_DENOMINATOR],
  ];
}

/** Signed decimal degrees of a DMS coordinate, negative south and west. */
export function dmsToDecimal(dms: Dms): number {
  const value = dms.degrees + dms.minutes / 60 + dms.seconds / 3600;
  return dms.ref === "S" || dms.ref === "W" ? -value : value;
}

function paint(width: number, height: number, pattern: "solid" | "petals", color: [number, number, number]): Uint8Array {
  const data = new Uint8Array(width * height * 4);
  const cx = width / 2;
  const cy = height / 2;
  const radius = Math.min(width, height) * 0.42;
  const petals = 6;
  for (let y = 0; y < height; y++) {
    for (let x = 0; x < width; x++) {
      let rgb = pattern === "solid" ? color : LEAF_GREEN;
      if (pattern === "petals") {
        const dx = x - cx;
        const dy = y - cy;
        const distance = Math.hypot(dx, dy) / radius;
        const angle = Math.atan2(dy, dx);
        // A rose curve: petal edges where |cos(k·θ/2)| reaches the distance from the centre.
        const petalEdge = Math.abs(Math.cos((petals * angle) / 2));
        if (distance < 0.18) rgb = POLLEN;
        else if (distance < petalEdge) {
          // Darker towards the petal's base, as a flower's nectar guides.
          const shade = 0.7 + 0.3 * distance;
          rgb = [color[0] * shade, color[1] * shade, color[2] * shade];
        } else {
          // A little texture in the leaves, so the encoder has something to compress.
          const vein = ((x * 7 + y * 13) % 23) - 11;
          rgb = [LEAF_GREEN[0] + vein, LEAF_GREEN[1] + vein, LEAF_GREEN[2] + vein];
        }
      }
      const i = (y * width + x) * 4;
      data[i] = Math.max(0, Math.min(255, Math.round(rgb[0])));
      data[i + 1] = Math.max(0, Math.min(255, Math.round(rgb[1])));
      data[i + 2] = Math.max(0, Math.min(255, Math.round(rgb[2])));
      data[i + 3] = 255;
    }
  }
  return data;
}

/** A JPEG without EXIF. */
export function makeJpeg({ width = 16, height = 16, pattern = "solid", color, quality = 85 }: PhotoOptions = {}): Buffer {
  const fill = color ?? (pattern === "solid" ? LEAF_GREEN : VIOLET);
  return jpeg.encode({ width, height, data: paint(width, height, pattern, fill) }, quality).data;
}

/**
 * A JPEG with EXIF: the description in IFD0 always, DateTimeOriginal and GPS when given.
 * `makeJpegWithExif({ width: 1600, height: 1200, pattern: "petals" })` makes a photo-sized file.
 */
export function makeJpegWithExif(options: PhotoOptions = {}): Buffer {
  const plain = makeJpeg(options);
  const exif: piexif.ExifDict = {
    "0th": { [piexif.ImageIFD.ImageDescription]: options.description ?? "Visitwort test photo" },
    Exif: {},
    GPS: {},
  };
  if (options.dateTimeOriginal) {
    exif.Exif![piexif.ExifIFD.DateTimeOriginal] = options.dateTimeOriginal;
  }
  if (options.gps) {
    const latitude = typeof options.gps.latitude === "number" ? toDms(options.gps.latitude, "latitude") : options.gps.latitude;
    const longitude = typeof options.gps.longitude === "number" ? toDms(options.gps.longitude, "longitude") : options.gps.longitude;
    exif.GPS = {
      [piexif.GPSIFD.GPSVersionID]: [2, 3, 0, 0],
      [piexif.GPSIFD.GPSLatitudeRef]: latitude.ref,
      [piexif.GPSIFD.GPSLatitude]: dmsRationals(latitude),
      [piexif.GPSIFD.GPSLongitudeRef]: longitude.ref,
      [piexif.GPSIFD.GPSLongitude]: dmsRationals(longitude),
    };
  }
  // piexifjs works on "binary" strings, one character per byte.
  const withExif = piexif.insert(piexif.dump(exif), plain.toString("binary"));
  return Buffer.from(withExif, "binary");
}

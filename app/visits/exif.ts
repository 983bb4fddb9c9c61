import exifr from "exifr";

/**
 * When and where a photo was taken, from its EXIF, to pre-fill a visit's date and place. Runs in
 * the browser on the chosen file, before upload; also under Node (tests). Pure: no request, no
 * database. Import it lazily (`await import("~/visits/exif")`): exifr is some 75 kB.
 */
export interface PhotoExif {
  /**
   * Local wall time "YYYY-MM-DDTHH:mm" as the camera's clock showed it. EXIF's date has no time
   * zone, so it is not turned into an instant here: the visit form treats it as the local time
   * of the place, like a time typed by hand.
   */
  takenAt: string | null;
  /** WGS84 decimal degrees, negative south. */
  latitude: number | null;
  /** WGS84 decimal degrees, negative west. */
  longitude: number | null;
}

const NOTHING: PhotoExif = { takenAt: null, latitude: null, longitude: null };

// JPEG keeps EXIF in an APP1 segment of at most 64 kB right after the start of the file;
// reading this much of a 20 MB photo is enough, and quick on a phone.
const JPEG_HEAD_BYTES = 256 * 1024;

const EXIF_OPTIONS = {
  // IFD0 is always read: it points to the EXIF and GPS blocks.
  tiff: true,
  exif: true,
  gps: true,
  ifd1: false,
  interop: false,
  makerNote: false,
  userComment: false,
  xmp: false,
  icc: false,
  iptc: false,
  jfif: false,
  ihdr: false,
  // Dates stay the strings the camera wrote: a Date would be placed in the browser's time
  // zone, and a wall time that zone skips (the spring-forward hour) would move.
  reviveValues: false,
  translateValues: false,
  translateKeys: true,
  mergeOutput: true,
};

const DATE_TIME = /^(\d{4})[:-](\d{2})[:-](\d{2})[ T](\d{2}):(\d{2})/;

/** "2025:04:27 09:41:05" → "2025-04-27T09:41"; null for blanks such as "0000:00:00 00:00:00". */
export function exifDateToWallTime(value: unknown): string | null {
  if (typeof value !== "string") return null;
  const match = DATE_TIME.exec(value.trim());
  if (!match) return null;
  const [, year, month, day, hour, minute] = match as unknown as [string, string, string, string, string, string];
  const y = Number(year);
  const m = Number(month);
  const d = Number(day);
  if (y < 1900 || m < 1 || m > 12 || d < 1 || d > new Date(Date.UTC(y, m, 0)).getUTCDate()) return null;
  if (Number(hour) > 23 || Number(minute) > 59) return null;
  return `${year}-${month}-${day}T${hour}:${minute}`;
}

function coordinate(value: unknown, limit: number): number | null {
  return typeof value === "number" && Number.isFinite(value) && Math.abs(value) <= limit ? value : null;
}

async function bytesOf(file: Blob | ArrayBuffer, limit?: number): Promise<ArrayBuffer> {
  if (file instanceof ArrayBuffer) return limit && file.byteLength > limit ? file.slice(0, limit) : file;
  // exifr reads a Blob itself only where `navigator` exists; an ArrayBuffer works everywhere.
  return (limit && file.size > limit ? file.slice(0, limit) : file).arrayBuffer();
}

async function parse(input: ArrayBuffer): Promise<Record<string, unknown> | null> {
  try {
    return ((await exifr.parse(input, EXIF_OPTIONS)) as Record<string, unknown> | undefined) ?? null;
  } catch {
    // Not an image exifr knows, or damaged: no EXIF, which is no error for the form.
    return null;
  }
}

function isJpeg(head: ArrayBuffer): boolean {
  const bytes = new Uint8Array(head, 0, Math.min(3, head.byteLength));
  return bytes[0] === 0xff && bytes[1] === 0xd8 && bytes[2] === 0xff;
}

/** The photo's time and place, each null when the photo does not say; never throws. */
export async function readPhotoExif(file: Blob | ArrayBuffer): Promise<PhotoExif> {
  try {
    const head = await bytesOf(file, JPEG_HEAD_BYTES);
    const size = file instanceof ArrayBuffer ? file.byteLength : file.size;
    // HEIC may keep its EXIF item anywhere in the file; a JPEG whose EXIF was not near the
    // start (rare, after some editors) is read whole as well.
    let tags = isJpeg(head) ? await parse(head) : null;
    if (!tags && (size > head.byteLength || !isJpeg(head))) tags = await parse(await bytesOf(file));
    if (!tags) return NOTHING;

    const takenAt = exifDateToWallTime(tags.DateTimeOriginal) ?? exifDateToWallTime(tags.CreateDate);
    let latitude = coordinate(tags.latitude, 90);
    let longitude = coordinate(tags.longitude, 180);
    // Exactly 0, 0 is what a camera without a fix writes more often than a photo taken in the
    // Gulf of Guinea (common practice, no source); one missing half makes the other useless.
    if ((latitude === 0 && longitude === 0) || latitude === null || longitude === null) latitude = longitude = null;
    return { takenAt, latitude, longitude };
  } catch {
    return NOTHING;
  }
}

/**
 * What kind of image a file really is, from its first bytes. The browser's declared type and
 * the file name are the uploader's word; these signatures are the file's own. Pure: the server
 * runs it on the first 64 bytes of an uploaded object, and a browser may run it on a chosen file.
 */

export const PHOTO_TYPES = ["image/jpeg", "image/png", "image/webp", "image/heic"] as const;
export type PhotoType = (typeof PHOTO_TYPES)[number];

/** How many leading bytes sniffImageType looks at, at most; read this many. */
export const SNIFF_BYTES = 64;

const PNG_SIGNATURE = [0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a];

// Brands that say "HEIF image coded with HEVC" (heic, heix and their sequence forms hevc,
// hevx), its tiled/layered variants (heim, heis), or a generic HEIF image or sequence (mif1,
// msf1), which phones write as the major brand with heic among the compatible ones.
const HEIF_BRANDS = new Set(["heic", "heix", "hevc", "hevx", "heim", "heis", "mif1", "msf1"]);
// Generic HEIF brands are shared with AVIF (AV1 in HEIF), which is not among the types we
// accept and which many browsers of our recorders cannot show back.
const GENERIC_HEIF_BRANDS = new Set(["mif1", "msf1"]);
const AVIF_BRANDS = new Set(["avif", "avis"]);

function startsWith(bytes: Uint8Array, signature: readonly number[], offset = 0): boolean {
  if (bytes.length < offset + signature.length) return false;
  return signature.every((value, index) => bytes[offset + index] === value);
}

function ascii(bytes: Uint8Array, offset: number, length: number): string {
  return String.fromCharCode(...bytes.subarray(offset, offset + length));
}

function isHeic(bytes: Uint8Array): boolean {
  // An ISO BMFF file starts with its ftyp box: 4-byte size, "ftyp", major brand, minor
  // version, then compatible brands up to the box's end.
  if (bytes.length < 12 || ascii(bytes, 4, 4) !== "ftyp") return false;
  const boxSize = ((bytes[0]! << 24) | (bytes[1]! << 16) | (bytes[2]! << 8) | bytes[3]!) >>> 0;
  if (boxSize < 16) return false;
  const majorBrand = ascii(bytes, 8, 4);
  if (!HEIF_BRANDS.has(majorBrand)) return false;
  if (!GENERIC_HEIF_BRANDS.has(majorBrand)) return true;

  const end = Math.min(boxSize, bytes.length);
  const compatible: string[] = [];
  for (let offset = 16; offset + 4 <= end; offset += 4) compatible.push(ascii(bytes, offset, 4));
  const namesHevc = compatible.some((brand) => HEIF_BRANDS.has(brand) && !GENERIC_HEIF_BRANDS.has(brand));
  return namesHevc || !compatible.some((brand) => AVIF_BRANDS.has(brand));
}

/** The image type the bytes begin like, or null when they are none of the accepted kinds. */
export function sniffImageType(firstBytes: Uint8Array): PhotoType | null {
  const bytes = firstBytes.subarray(0, SNIFF_BYTES);
  if (startsWith(bytes, [0xff, 0xd8, 0xff])) return "image/jpeg";
  if (startsWith(bytes, PNG_SIGNATURE)) return "image/png";
  if (bytes.length >= 12 && ascii(bytes, 0, 4) === "RIFF" && ascii(bytes, 8, 4) === "WEBP") return "image/webp";
  if (isHeic(bytes)) return "image/heic";
  return null;
}

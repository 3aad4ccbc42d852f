import "server-only";
import sharp from "sharp";
import { BODY_LIMITS } from "@/lib/domain/request-limits";
import { translatorFor, type Translator } from "@/lib/domain/i18n/catalogue";
import { localFileTooLarge } from "@/lib/domain/i18n/files";

// Photos are accepted by what their bytes are, then re-encoded: re-encoding drops every metadata block
// (camera serial, GPS position of the farm) unless the grower chose to keep the location.

export const MAX_PHOTO_BYTES = BODY_LIMITS.photo.fileBytes;
// 50 megapixels covers phone cameras; larger "images" are usually decompression bombs.
const MAX_PIXELS = 50_000_000;

export type ImageType = "image/jpeg" | "image/png" | "image/webp";

export class PhotoRefused extends Error {
  constructor(message: string) {
    super(message);
    this.name = "PhotoRefused";
  }
}

/** The image type from the file's first bytes, or null; the name and the browser's claim are ignored. */
export function detectImage(b: Uint8Array): ImageType | null {
  if (b.length >= 3 && b[0] === 0xff && b[1] === 0xd8 && b[2] === 0xff) return "image/jpeg";
  if (b.length >= 8 && [0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a].every((x, i) => b[i] === x)) return "image/png";
  if (b.length >= 12 && String.fromCharCode(...b.subarray(0, 4)) === "RIFF" && String.fromCharCode(...b.subarray(8, 12)) === "WEBP") return "image/webp";
  return null;
}

function isHeic(b: Uint8Array) {
  return b.length >= 12 && String.fromCharCode(...b.subarray(4, 8)) === "ftyp" && /^(heic|heix|hevc|mif1|msf1|avif)$/.test(String.fromCharCode(...b.subarray(8, 12)));
}

/** Checks and re-encodes a photo. Returns the bytes to store and their type; refusals in the language of `opts.t`. */
export async function preparePhoto(bytes: Uint8Array, opts: { keepLocation: boolean; t?: Translator }): Promise<{ bytes: Buffer; contentType: ImageType; width: number; height: number }> {
  const t = opts.t ?? translatorFor();
  if (bytes.length === 0) throw new PhotoRefused(t("photos.empty"));
  if (bytes.length > MAX_PHOTO_BYTES) throw new PhotoRefused(localFileTooLarge(t, "photo", bytes.length));
  const type = detectImage(bytes);
  if (!type) {
    if (isHeic(bytes)) throw new PhotoRefused(t("photos.heic"));
    throw new PhotoRefused(t("photos.notImage"));
  }
  let img = sharp(bytes, { failOn: "error", limitInputPixels: MAX_PIXELS }).rotate();
  if (opts.keepLocation) img = img.keepMetadata();
  try {
    const out = type === "image/png" ? await img.png().toBuffer({ resolveWithObject: true }) : type === "image/webp" ? await img.webp({ quality: 85 }).toBuffer({ resolveWithObject: true }) : await img.jpeg({ quality: 88, mozjpeg: true }).toBuffer({ resolveWithObject: true });
    return { bytes: out.data, contentType: type, width: out.info.width, height: out.info.height };
  } catch {
    throw new PhotoRefused(t("photos.damaged"));
  }
}

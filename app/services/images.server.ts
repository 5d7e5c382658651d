import { createHash, randomBytes } from "node:crypto";
import heicDecode from "heic-decode";
import pLimit from "p-limit";
import sharp, { type Metadata, type OutputInfo, type Sharp } from "sharp";
import type { MediaVariant } from "~/db/schema";
import { tooLarge, unsupportedType } from "~/utils/errors";
import type { Storage } from "./storage.server";

/** The largest photo accepted, in bytes (api.md, `POST /api/media`). */
export const MAX_UPLOAD_BYTES = 25 * 1024 * 1024;
/** The most pixels a photo may decode to: a small file can expand to a huge image. */
export const MAX_INPUT_PIXELS = 40_000_000;
/** Widths served through `srcset`; an image is never enlarged past its own width. */
export const VARIANT_WIDTHS = [480, 960, 1600] as const;
/** Image jobs running at once in this process; the rest wait their turn. */
export const IMAGE_JOBS_AT_ONCE = 2;

/** What the pipeline needs of the store: writing objects, and deleting them again on failure. */
export type PhotoStore = Pick<Storage, "put" | "delete">;

export type PhotoType = "jpeg" | "png" | "webp" | "heic";

export const ACCEPTED_FORMATS_TEXT = "JPEG, PNG, WebP or HEIC";
const notAPhoto = () =>
  unsupportedType(
    `This file is not a photo we accept. Send a ${ACCEPTED_FORMATS_TEXT} image (the type is read from the file itself).`,
  );
const unreadable = () =>
  unsupportedType(`The photo could not be read: it may be damaged or cut short. Send a complete ${ACCEPTED_FORMATS_TEXT} image.`);
const tooManyPixels = () =>
  tooLarge(`The photo is larger than ${MAX_INPUT_PIXELS / 1_000_000} megapixels. Send a smaller image.`);

/**
 * ISOBMFF major brands of HEIF still images and sequences (ISO/IEC 23008-12 Annex B; the "mif1" and
 * "msf1" structural brands, "heic"/"heix" for HEVC images, "hevc"/"hevx" for HEVC sequences, and
 * "heim"/"heis" for the multi-layer and scalable HEVC profiles).
 */
const HEIF_BRANDS = new Set(["heic", "heix", "hevc", "hevx", "heim", "heis", "mif1", "msf1"]);

/**
 * The photo's type from its first bytes, never from its name: JPEG SOI marker FF D8 FF (ITU-T T.81
 * Annex B), the PNG signature 89 50 4E 47 0D 0A 1A 0A (RFC 2083 §3.1), RIFF….WEBP (RFC 9649 §2.5),
 * and an ISOBMFF `ftyp` box with a HEIF major brand (ISO/IEC 14496-12 §4.3). Null for anything else;
 * 12 bytes are enough to decide.
 */
export function detectPhotoType(head: Uint8Array): PhotoType | null {
  const ascii = (from: number, to: number) => String.fromCharCode(...head.subarray(from, to));
  if (head.length >= 3 && head[0] === 0xff && head[1] === 0xd8 && head[2] === 0xff) return "jpeg";
  if (head.length >= 8 && [0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a].every((b, i) => head[i] === b)) return "png";
  if (head.length >= 12 && ascii(0, 4) === "RIFF" && ascii(8, 12) === "WEBP") return "webp";
  if (head.length >= 12 && ascii(4, 8) === "ftyp" && HEIF_BRANDS.has(ascii(8, 12))) return "heic";
  return null;
}

export type ProcessedImage = {
  keyPrefix: string;
  width: number;
  height: number;
  bytes: number;
  sha256: string;
  variants: MediaVariant[];
};

const jobs = pLimit(IMAGE_JOBS_AT_ONCE);

/** How many image jobs run and wait right now (for the queue's state and the benchmark). */
export const imageQueue = () => ({ running: jobs.activeCount, waiting: jobs.pendingCount });

/** A sharp error that means the decoded image is over the pixel limit. */
const isPixelLimit = (error: unknown) => /pixel limit/i.test(String((error as Error)?.message ?? error));

/** The input for sharp: the file itself, or for HEIC (which sharp's prebuilt build cannot decode) its RGBA pixels. */
type Decoded = { image: Sharp; width: number; height: number };

async function decodeInput(input: Buffer, type: PhotoType): Promise<Decoded> {
  // failOn "warning" (sharp's default, kept on purpose): a JPEG cut short is refused, not grey-filled.
  const options = { limitInputPixels: MAX_INPUT_PIXELS, failOn: "warning" } as const;
  if (type !== "heic") {
    let meta: Metadata;
    try {
      meta = await sharp(input, options).metadata();
    } catch (error) {
      if (isPixelLimit(error)) throw tooManyPixels();
      throw unreadable();
    }
    // The bytes promised one format and the decoder found another (or none).
    if (meta.format !== type) throw unreadable();
    if (meta.width * meta.height > MAX_INPUT_PIXELS) throw tooManyPixels();
    return { image: sharp(input, { ...options, autoOrient: true }), ...meta.autoOrient };
  }
  let images: Awaited<ReturnType<typeof heicDecode.all>> & { dispose?: () => void };
  try {
    images = await heicDecode.all({ buffer: input });
  } catch {
    throw unreadable();
  }
  try {
    const first = images[0] as (typeof images)[number] & { width: number; height: number };
    if (!first) throw unreadable();
    // The size is in the file's headers: refuse before any pixel is decoded.
    if (first.width * first.height > MAX_INPUT_PIXELS) throw tooManyPixels();
    let decoded: Awaited<ReturnType<(typeof first)["decode"]>>;
    try {
      decoded = await first.decode();
    } catch {
      throw unreadable();
    }
    // libheif applies the file's rotation and mirror boxes (irot, imir) while decoding: the pixels are upright.
    const pixels = Buffer.from(decoded.data.buffer, decoded.data.byteOffset, decoded.data.byteLength);
    const image = sharp(pixels, { ...options, raw: { width: decoded.width, height: decoded.height, channels: 4 } });
    return { image, width: decoded.width, height: decoded.height };
  } finally {
    images.dispose?.();
  }
}

/**
 * Reads an upload, turns it upright, drops all metadata (EXIF with GPS included: sharp writes none
 * unless asked) and stores WebP and JPEG copies at each width. The original is never stored. If
 * any step fails, the objects already written are deleted before the error goes on.
 */
export function processImage(storage: PhotoStore, input: Buffer): Promise<ProcessedImage> {
  if (input.byteLength > MAX_UPLOAD_BYTES) {
    return Promise.reject(tooLarge(`The photo is larger than ${MAX_UPLOAD_BYTES / 1024 / 1024} MB.`));
  }
  const type = detectPhotoType(input);
  if (!type) return Promise.reject(notAPhoto());
  return jobs(() => runJob(storage, input, type));
}

async function runJob(storage: PhotoStore, input: Buffer, type: PhotoType): Promise<ProcessedImage> {
  const source = await decodeInput(input, type);
  const largest = Math.max(...VARIANT_WIDTHS);
  // Decode once, upright, to the largest width needed (never enlarged), and make every variant from that.
  let base: { data: Buffer; info: OutputInfo };
  try {
    base = await source.image.resize({ width: largest, withoutEnlargement: true }).raw().toBuffer({ resolveWithObject: true });
  } catch (error) {
    if (isPixelLimit(error)) throw tooManyPixels();
    throw unreadable();
  }
  const raw = { width: base.info.width, height: base.info.height, channels: base.info.channels };

  const keyPrefix = `photos/${new Date().toISOString().slice(0, 7)}/${randomBytes(12).toString("base64url")}`;
  const widths: number[] = VARIANT_WIDTHS.filter((w) => w < base.info.width);
  if (widths.length < VARIANT_WIDTHS.length) widths.push(base.info.width);

  const written: string[] = [];
  const variants: MediaVariant[] = [];
  try {
    for (const width of widths) {
      const resized = sharp(base.data, { raw }).resize({ width, withoutEnlargement: true });
      for (const format of ["webp", "jpeg"] as const) {
        const out =
          format === "webp"
            ? await resized.clone().webp({ quality: 78 }).toBuffer({ resolveWithObject: true })
            : await resized.clone().flatten({ background: "#ffffff" }).jpeg({ quality: 80, mozjpeg: true }).toBuffer({
                resolveWithObject: true,
              });
        const key = `${keyPrefix}/${width}.${format === "jpeg" ? "jpg" : "webp"}`;
        written.push(key);
        await storage.put(key, out.data, `image/${format}`);
        variants.push({ width: out.info.width, height: out.info.height, format, key, bytes: out.info.size });
      }
    }
  } catch (error) {
    // Nothing half-stored is left behind; a store that fails is our fault and stays a 500.
    await storage.delete(written).catch(() => undefined);
    throw error;
  }
  return {
    keyPrefix,
    width: source.width,
    height: source.height,
    bytes: input.byteLength,
    sha256: createHash("sha256").update(input).digest("hex"),
    variants,
  };
}

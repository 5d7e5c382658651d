import { createHash, randomBytes } from "node:crypto";
import sharp from "sharp";
import type { MediaVariant } from "~/db/schema";
import { tooLarge, unsupportedType } from "~/utils/errors";
import type { Storage } from "./storage.server";

export const MAX_UPLOAD_BYTES = 12 * 1024 * 1024;
const ACCEPTED_FORMATS = new Set(["jpeg", "png", "webp", "heif", "avif", "tiff"]);
/** Widths served through `srcset`; an image is never enlarged past its own width. */
export const VARIANT_WIDTHS = [480, 960, 1600] as const;

const unreadable = () => unsupportedType("The file is not an image we can read (JPEG, PNG, WebP, HEIF or TIFF).");

export type ProcessedImage = {
  keyPrefix: string;
  width: number;
  height: number;
  bytes: number;
  sha256: string;
  variants: MediaVariant[];
};

/**
 * Reads an upload, turns it upright, drops all metadata (EXIF with GPS included: sharp writes none
 * unless asked) and stores WebP and JPEG copies at each width.
 */
export async function processImage(storage: Storage, input: Buffer): Promise<ProcessedImage> {
  if (input.byteLength > MAX_UPLOAD_BYTES) {
    throw tooLarge(`The photo is larger than ${MAX_UPLOAD_BYTES / 1024 / 1024} MB.`);
  }
  let meta: Awaited<ReturnType<ReturnType<typeof sharp>["metadata"]>>;
  try {
    meta = await sharp(input).metadata();
  } catch {
    throw unreadable();
  }
  if (!meta.format || !ACCEPTED_FORMATS.has(meta.format)) {
    throw unreadable();
  }
  const upright = sharp(input).rotate();
  const { info } = await upright.clone().toBuffer({ resolveWithObject: true });
  const keyPrefix = `photos/${new Date().toISOString().slice(0, 7)}/${randomBytes(9).toString("base64url")}`;
  const widths: number[] = VARIANT_WIDTHS.filter((w) => w < info.width);
  if (widths.length < VARIANT_WIDTHS.length) widths.push(info.width);

  const variants: MediaVariant[] = [];
  for (const width of widths) {
    const resized = upright.clone().resize({ width, withoutEnlargement: true });
    for (const format of ["webp", "jpeg"] as const) {
      const out =
        format === "webp"
          ? await resized.clone().webp({ quality: 78 }).toBuffer({ resolveWithObject: true })
          : await resized.clone().jpeg({ quality: 80, mozjpeg: true }).toBuffer({ resolveWithObject: true });
      const key = `${keyPrefix}/${width}.${format === "jpeg" ? "jpg" : "webp"}`;
      await storage.put(key, out.data, `image/${format}`);
      variants.push({ width: out.info.width, height: out.info.height, format, key, bytes: out.info.size });
    }
  }
  return {
    keyPrefix,
    width: info.width,
    height: info.height,
    bytes: input.byteLength,
    sha256: createHash("sha256").update(input).digest("hex"),
    variants,
  };
}

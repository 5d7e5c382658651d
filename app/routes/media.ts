import type { Readable } from "node:stream";
import { getStorage } from "~/services/storage.server";
import type { Route } from "./+types/media";

/**
 * What /media serves: only the photo formats the app itself writes, each known by the key's
 * extension, the stored Content-Type and the file's first bytes (WebP: "RIFF", a size, "WEBP", the RIFF
 * header of RFC 9649; JPEG: the SOI marker FF D8 followed by another marker, ITU-T T.81 annex B).
 */
const PHOTO_TYPES = {
  webp: {
    type: "image/webp",
    matches: (b: Buffer) => b.toString("latin1", 0, 4) === "RIFF" && b.toString("latin1", 8, 12) === "WEBP",
  },
  jpg: { type: "image/jpeg", matches: (b: Buffer) => b[0] === 0xff && b[1] === 0xd8 && b[2] === 0xff },
} as const;
const SNIFF_BYTES = 12;

const notFound = () => new Response("Not found", { status: 404 });

/** The first `n` bytes of a stream, and the stream's remaining chunks. */
async function splitHead(body: Readable, n: number) {
  const chunks = body[Symbol.asyncIterator]() as AsyncIterator<Buffer>;
  let head = Buffer.alloc(0);
  while (head.length < n) {
    const next = await chunks.next();
    if (next.done) break;
    head = Buffer.concat([head, next.value]);
  }
  return { head, chunks };
}

/** Serves stored photos when no public bucket or CDN address is configured (S3_PUBLIC_URL empty). */
export async function loader({ params }: Route.LoaderArgs) {
  const key = params["*"] ?? "";
  const match = /^photos\/[\w/-]+\.(webp|jpg)$/.exec(key);
  if (!match) throw notFound();
  const expected = PHOTO_TYPES[match[1] as keyof typeof PHOTO_TYPES];
  let object: Awaited<ReturnType<ReturnType<typeof getStorage>["get"]>>;
  try {
    object = await getStorage().get(key);
  } catch {
    throw notFound();
  }
  // Whatever else sits in the bucket under a photo's name is not served from our origin.
  const storedType = object.contentType?.split(";")[0].trim().toLowerCase();
  const { head, chunks } =
    storedType === expected.type ? await splitHead(object.body, SNIFF_BYTES) : { head: undefined, chunks: undefined };
  if (!head || !chunks || head.length < SNIFF_BYTES || !expected.matches(head)) {
    object.body.destroy();
    throw notFound();
  }
  const body = new ReadableStream<Uint8Array>({
    start(controller) {
      controller.enqueue(head);
    },
    async pull(controller) {
      const next = await chunks.next();
      if (next.done) controller.close();
      else controller.enqueue(next.value);
    },
    cancel() {
      object.body.destroy();
    },
  });
  return new Response(body, {
    headers: {
      "content-type": expected.type,
      "cache-control": "public, max-age=31536000, immutable",
      "x-content-type-options": "nosniff",
      // Opened on its own, the file is an inert image: no scripts, no requests, no plugins.
      "content-security-policy": "default-src 'none'; style-src 'unsafe-inline'; frame-ancestors 'none'; sandbox",
      ...(object.contentLength ? { "content-length": String(object.contentLength) } : {}),
    },
  });
}

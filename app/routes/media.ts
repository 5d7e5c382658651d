import { Readable } from "node:stream";
import { getStorage } from "~/services/storage.server";
import type { Route } from "./+types/media";

/** Serves stored photos when no public bucket or CDN address is configured (S3_PUBLIC_URL empty). */
export async function loader({ params }: Route.LoaderArgs) {
  const key = params["*"] ?? "";
  if (!/^photos\/[\w/-]+\.(webp|jpg)$/.test(key)) throw new Response("Not found", { status: 404 });
  try {
    const object = await getStorage().get(key);
    return new Response(Readable.toWeb(object.body) as ReadableStream, {
      headers: {
        "content-type": object.contentType ?? "application/octet-stream",
        "cache-control": "public, max-age=31536000, immutable",
        ...(object.contentLength ? { "content-length": String(object.contentLength) } : {}),
      },
    });
  } catch {
    throw new Response("Not found", { status: 404 });
  }
}

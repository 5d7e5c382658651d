import sharp from "sharp";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { getStorage } from "~/services/storage.server";
import { startAppServer } from "../support/app-server";
import { useTestDatabase } from "../support/base-db";

let app: Awaited<ReturnType<typeof startAppServer>>;
const prefix = `photos/2030-01/media-test-${Date.now().toString(36)}`;
const HTML = "<!doctype html><html><body><script>document.title = 'served as a page'</script></body></html>";

let webp: Buffer;
let jpeg: Buffer;

beforeAll(async () => {
  useTestDatabase("media");
  app = await startAppServer();
  const image = sharp({ create: { width: 8, height: 8, channels: 3, background: "#2f6f5e" } });
  webp = await image.clone().webp().toBuffer();
  jpeg = await image.clone().jpeg().toBuffer();
  const storage = getStorage();
  await storage.put(`${prefix}/good.webp`, webp, "image/webp");
  await storage.put(`${prefix}/good.jpg`, jpeg, "image/jpeg");
  // What someone with write access to the bucket (or a bug) might leave under a photo's name.
  await storage.put(`${prefix}/page.webp`, Buffer.from(HTML), "text/html");
  await storage.put(`${prefix}/page.jpg`, Buffer.from(HTML), "text/html; charset=utf-8");
  await storage.put(`${prefix}/disguised.webp`, Buffer.from(HTML), "image/webp");
  await storage.put(`${prefix}/swapped.jpg`, webp, "image/webp");
  await storage.put(`${prefix}/tiny.webp`, Buffer.from("RIFF"), "image/webp");
});
afterAll(async () => app?.stop());

const media = (name: string) => fetch(`${app.origin}/media/${prefix}/${name}`);

describe("/media", () => {
  it("serves the photo formats the app writes, inert and unsniffable", async () => {
    for (const [name, type, bytes] of [
      ["good.webp", "image/webp", webp],
      ["good.jpg", "image/jpeg", jpeg],
    ] as const) {
      const response = await media(name);
      expect(response.status).toBe(200);
      expect(response.headers.get("content-type")).toBe(type);
      expect(response.headers.get("x-content-type-options")).toBe("nosniff");
      expect(response.headers.get("content-security-policy")).toMatch(/^default-src 'none';.*sandbox/);
      expect(Buffer.from(await response.arrayBuffer()).equals(bytes)).toBe(true);
    }
  });

  it("never serves an object stored as text/html, even under a photo's name", async () => {
    for (const name of ["page.webp", "page.jpg"]) {
      const response = await media(name);
      expect(response.headers.get("content-type") ?? "").not.toMatch(/html/);
      expect(await response.text()).not.toContain("<script>");
      expect(response.status).toBe(404);
      expect(response.headers.get("cache-control") ?? "").not.toMatch(/max-age=31536000/);
    }
  });

  it("checks the file's own first bytes and the key's extension, not just the stored type", async () => {
    for (const name of ["disguised.webp", "swapped.jpg", "tiny.webp"]) {
      const response = await media(name);
      expect(response.status, name).toBe(404);
      expect(await response.text()).not.toContain("<script>");
    }
  });

  it("answers 404 for keys outside the photo pattern", async () => {
    expect((await fetch(`${app.origin}/media/${prefix}/page.html`)).status).toBe(404);
    expect((await fetch(`${app.origin}/media/other/${prefix}/good.webp`)).status).toBe(404);
  });
});

import { readFile } from "node:fs/promises";
import { eq, inArray } from "drizzle-orm";
import exifr from "exifr";
import sharp, { type Sharp } from "sharp";
import { beforeAll, describe, expect, it } from "vitest";
import { getDb } from "~/db/client.server";
import { media } from "~/db/schema";
import type { DraftView } from "~/models/drafts.server";
import { sweepUnusedMedia, UNUSED_MEDIA_MAX_AGE_MS } from "~/models/media.server";
import { getStorage } from "~/services/storage.server";
import { readPhotoUpload } from "~/services/upload.server";
import { CATEGORIES } from "~/utils/vocab";
import type { TestClient } from "../support/http-client";
import { sharedApp } from "../support/shared-app";

// POST /api/media (design/api.md) over real HTTP with multipart FormData, on the shared development
// server, its SQLite file and the local S3 stand-in. Sources are named at each case.

const app = sharedApp("media-upload");
let author: TestClient;
let reader: TestClient;
let authorId: number;

type Photo = { id: number; width: number; height: number; variants: { width: number; format: string; url: string }[] };
type ApiError = { error: { code: string; message: string; fields?: Record<string, string> } };

async function signIn(email: string) {
  const client = app.client();
  const response = await client.signIn(email, "torqueleaf-demo");
  if (response.status !== 302) throw new Error(`could not sign in ${email}: ${response.status}`);
  return client;
}

beforeAll(async () => {
  author = await signIn("author@torqueleaf.test");
  reader = await signIn("reader@torqueleaf.test");
  authorId = (await author.me())?.id ?? 0;
});

async function upload(client: TestClient, bytes: Uint8Array, name = "photo.jpg", type = "application/octet-stream") {
  const form = new FormData();
  form.append("file", new Blob([new Uint8Array(bytes)], { type }), name);
  const response = await client.request("/api/media", { method: "POST", body: form });
  return { status: response.status, body: (await response.json()) as Photo & ApiError };
}

/** The stored bytes of a variant, read back from the S3 stand-in by its key. */
async function stored(url: string) {
  const key = url.replace(/^.*?\/media\//, "");
  const object = await getStorage().get(key);
  const chunks: Buffer[] = [];
  for await (const chunk of object.body) chunks.push(chunk as Buffer);
  return { key, bytes: Buffer.concat(chunks), contentType: object.contentType };
}

const ownRows = async () => (await getDb()).$count(media, eq(media.ownerId, authorId));
const allObjects = () => getStorage().list("photos/");

describe("POST /api/media", () => {
  it("stores the three widths as WebP and JPEG with their Content-Type, never the original, never enlarged", async () => {
    const jpeg = await sharp({ create: { width: 2400, height: 1600, channels: 3, background: "#6a8f3c" } })
      .jpeg({ quality: 90 })
      .toBuffer();
    const before = await allObjects();
    const { status, body } = await upload(author, jpeg);
    expect(status).toBe(201);
    expect(body).toMatchObject({ width: 2400, height: 1600 });
    expect(body.variants.map((v) => `${v.width}.${v.format}`).sort()).toEqual(
      ["480.webp", "480.jpeg", "960.webp", "960.jpeg", "1600.webp", "1600.jpeg"].sort(),
    );
    for (const variant of body.variants) {
      const object = await stored(variant.url);
      // RFC 9649 §10 registers image/webp; image/jpeg is RFC 2046's.
      expect(object.contentType).toBe(variant.format === "webp" ? "image/webp" : "image/jpeg");
      const meta = await sharp(object.bytes).metadata();
      expect(meta.format).toBe(variant.format);
      expect(meta.width).toBe(variant.width);
      expect(meta.height).toBe(Math.round((variant.width * 1600) / 2400));
    }
    const added = (await allObjects()).filter((k) => !before.includes(k));
    expect(added).toHaveLength(6);
    // Random keys, and nothing else under the photo's prefix (no original).
    const prefix = added[0].split("/").slice(0, 3).join("/");
    expect(added.every((k) => k.startsWith(`${prefix}/`))).toBe(true);
    expect(prefix.split("/")[2]).toMatch(/^[A-Za-z0-9_-]{16}$/);

    const small = await sharp({ create: { width: 300, height: 200, channels: 3, background: "#223344" } })
      .png()
      .toBuffer();
    const tiny = await upload(author, small, "small.png");
    expect(tiny.status).toBe(201);
    expect(tiny.body.variants.map((v) => v.width)).toEqual([300, 300]);
  });

  it("drops EXIF, GPS included, from every stored variant", async () => {
    // sharp names the GPS IFD "IFD3" (sharp docs, withExif); tags from EXIF 2.32 (CIPA DC-008) §4.6.6.
    const jpeg = await sharp({ create: { width: 1200, height: 800, channels: 3, background: "#996633" } })
      .withExif({
        IFD0: { Make: "Calder", Model: "Kestrel Cam", Software: "invented" },
        IFD3: { GPSLatitudeRef: "N", GPSLatitude: "59/1 54/1 3000/100", GPSLongitudeRef: "E", GPSLongitude: "10/1 45/1 0/1" },
      })
      .jpeg()
      .toBuffer();
    // The fixture really carries a position (read by exifr, an independent EXIF parser).
    const gps = await exifr.gps(jpeg);
    expect(gps?.latitude).toBeCloseTo(59.9083, 3);

    const { status, body } = await upload(author, jpeg, "with-position.jpg");
    expect(status).toBe(201);
    expect(body.variants).toHaveLength(6);
    for (const variant of body.variants) {
      const { bytes } = await stored(variant.url);
      const meta = await sharp(bytes).metadata();
      expect(meta.exif, variant.url).toBeUndefined();
      expect(meta.xmp, variant.url).toBeUndefined();
      expect(meta.iptc, variant.url).toBeUndefined();
      // The APP1 "Exif\0\0" header (EXIF 2.32 §4.5.4) and the WebP "EXIF"/"XMP " chunks (RFC 9649 §2.7) are absent.
      expect(bytes.includes(Buffer.from("Exif\0\0", "latin1")), variant.url).toBe(false);
      expect(bytes.includes(Buffer.from("Calder")), variant.url).toBe(false);
      if (variant.format === "webp") {
        expect(bytes.includes(Buffer.from("EXIF")) || bytes.includes(Buffer.from("XMP "))).toBe(false);
      } else {
        expect(await exifr.gps(bytes).catch(() => undefined)).toBeUndefined();
        expect(await exifr.parse(bytes).catch(() => undefined)).toBeUndefined();
      }
    }
  });

  it("turns all 8 EXIF orientations upright: the marked corner ends top-left", async () => {
    // EXIF 2.32 (CIPA DC-008) tag 0x0112: how the stored rows and columns map to the view. The
    // fixture is the upright picture U put through the inverse of that mapping, so showing it as
    // the tag says gives U again: 1 none, 2 mirror, 3 half turn, 4 flip, 5 transpose, 6 a quarter
    // turn clockwise to show (so a quarter turn anticlockwise to store), 7 transverse, 8 the reverse of 6.
    const W = 240;
    const H = 160;
    const red = { r: 230, g: 20, b: 20 };
    const blue = { r: 20, g: 40, b: 220 };
    const marker = await sharp({ create: { width: 80, height: 60, channels: 3, background: red } })
      .png()
      .toBuffer();
    const uprightPicture = await sharp({ create: { width: W, height: H, channels: 3, background: blue } })
      .composite([{ input: marker, left: 0, top: 0 }])
      .png()
      .toBuffer();
    const step = (input: Buffer, op: (s: Sharp) => Sharp) => op(sharp(input)).png().toBuffer();
    const inverse: Record<number, (b: Buffer) => Promise<Buffer>> = {
      1: async (b) => b,
      2: (b) => step(b, (s) => s.flop()),
      3: (b) => step(b, (s) => s.rotate(180)),
      4: (b) => step(b, (s) => s.flip()),
      5: async (b) => step(await step(b, (s) => s.rotate(90)), (s) => s.flop()),
      6: (b) => step(b, (s) => s.rotate(270)),
      7: async (b) => step(await step(b, (s) => s.rotate(270)), (s) => s.flop()),
      8: (b) => step(b, (s) => s.rotate(90)),
    };
    for (let orientation = 1; orientation <= 8; orientation++) {
      const stored_ = await inverse[orientation](uprightPicture);
      const fixture = await sharp(stored_).withMetadata({ orientation }).jpeg({ quality: 95 }).toBuffer();
      expect((await exifr.orientation(fixture)) ?? 1, `fixture ${orientation}`).toBe(orientation);

      const { status, body } = await upload(author, fixture, `orientation-${orientation}.jpg`);
      expect(status, `orientation ${orientation}`).toBe(201);
      expect([body.width, body.height], `orientation ${orientation}`).toEqual([W, H]);
      for (const variant of body.variants) {
        const { bytes } = await stored(variant.url);
        const { data, info } = await sharp(bytes).raw().toBuffer({ resolveWithObject: true });
        expect([info.width, info.height]).toEqual([W, H]);
        const at = (x: number, y: number) => {
          const i = (y * info.width + x) * info.channels;
          return { r: data[i], g: data[i + 1], b: data[i + 2] };
        };
        const label = `orientation ${orientation}, ${variant.format}`;
        expect(at(10, 10).r, label).toBeGreaterThan(180);
        expect(at(10, 10).b, label).toBeLessThan(80);
        for (const [x, y] of [
          [W - 10, 10],
          [10, H - 10],
          [W - 10, H - 10],
        ]) {
          expect(at(x, y).b, `${label} at ${x},${y}`).toBeGreaterThan(180);
          expect(at(x, y).r, `${label} at ${x},${y}`).toBeLessThan(80);
        }
      }
    }
  });

  it("accepts a HEIC photo from a phone and stores it upright as WebP and JPEG", async () => {
    // tests/fixtures/README.md: HEVC-in-HEIF (brand "heic") made with Debian's heif-enc, a red block
    // in the top-left corner of a blue 640 × 480 picture.
    const heic = await readFile(new URL("../fixtures/marked-corner-640x480.heic", import.meta.url));
    expect(heic.subarray(4, 12).toString("latin1")).toBe("ftypheic");
    const { status, body } = await upload(author, heic, "IMG_0001.HEIC", "image/heic");
    expect(status).toBe(201);
    expect([body.width, body.height]).toEqual([640, 480]);
    expect(new Set(body.variants.map((v) => v.format))).toEqual(new Set(["webp", "jpeg"]));
    for (const variant of body.variants) {
      const { bytes, contentType } = await stored(variant.url);
      expect(contentType).toBe(`image/${variant.format}`);
      const { data, info } = await sharp(bytes).raw().toBuffer({ resolveWithObject: true });
      expect(info.width).toBeLessThanOrEqual(640);
      const at = (x: number, y: number) => data[(y * info.width + x) * info.channels];
      const px = (x: number, y: number) => ({ r: at(x, y), b: data[(y * info.width + x) * info.channels + 2] });
      const scale = info.width / 640;
      expect(px(Math.round(20 * scale), Math.round(20 * scale)).r, variant.url).toBeGreaterThan(180);
      expect(px(info.width - 10, info.height - 10).b, variant.url).toBeGreaterThan(150);
      expect(px(info.width - 10, info.height - 10).r, variant.url).toBeLessThan(90);
    }
  });

  it("refuses a photo that decodes to more than 40 megapixels with 413, however small the file", async () => {
    const huge = await sharp({ create: { width: 16000, height: 16000, channels: 3, background: "#000000" } })
      .png({ compressionLevel: 9, palette: false })
      .toBuffer();
    expect(huge.byteLength).toBeLessThan(1024 * 1024);
    const rows = await ownRows();
    const objects = (await allObjects()).length;
    const { status, body } = await upload(author, huge, "plain.png");
    expect(status).toBe(413);
    expect(body.error.message).toMatch(/40 megapixels/);
    expect(await ownRows()).toBe(rows);
    expect((await allObjects()).length).toBe(objects);
  });

  it("refuses what is not a photo, or is a damaged one, with 415 and leaves no object and no row", async () => {
    const jpeg = await sharp({ create: { width: 1000, height: 700, channels: 3, background: "#445566" } })
      .jpeg()
      .toBuffer();
    const samples: [string, Buffer, string][] = [
      // Cut short after the headers: the entropy-coded data ends early (ITU-T T.81 Annex B).
      ["truncated.jpg", jpeg.subarray(0, Math.floor(jpeg.byteLength / 3)), "image/jpeg"],
      ["renamed.jpg", Buffer.from(JSON.stringify({ title: "not a photo", steps: [] })), "image/jpeg"],
      // ISO 32000 files start with "%PDF-".
      [
        "manual.pdf",
        Buffer.from("%PDF-1.7\n1 0 obj << /Type /Catalog >> endobj\ntrailer << /Root 1 0 R >>\n%%EOF\n"),
        "application/pdf",
      ],
      [
        "diagram.svg",
        Buffer.from('<svg xmlns="http://www.w3.org/2000/svg" width="10" height="10"><script>alert(1)</script></svg>'),
        "image/svg+xml",
      ],
      // An ISOBMFF box with a HEIF brand and no image in it.
      [
        "empty.heic",
        Buffer.concat([Buffer.from([0, 0, 0, 24]), Buffer.from("ftypheic\0\0\0\0mif1heic"), Buffer.alloc(64)]),
        "image/heic",
      ],
    ];
    const rows = await ownRows();
    const objects = await allObjects();
    for (const [name, bytes, type] of samples) {
      const { status, body } = await upload(author, bytes, name, type);
      expect(status, name).toBe(415);
      expect(body.error.message, name).toMatch(/JPEG, PNG, WebP or HEIC/);
    }
    expect(await ownRows()).toBe(rows);
    expect(await allObjects()).toEqual(objects);
  });

  it("answers 400 naming the field when no photo comes, and 415 for a body that is not multipart", async () => {
    const form = new FormData();
    form.append("caption", "no file here");
    const missing = await author.request("/api/media", { method: "POST", body: form });
    expect(missing.status).toBe(400);
    expect(((await missing.json()) as ApiError).error.fields?.file).toMatch(/Choose a photo/);

    const json = await author.request("/api/media", {
      method: "POST",
      headers: { "content-type": "application/json" },
      body: "{}",
    });
    expect(json.status).toBe(415);
    expect(((await json.json()) as ApiError).error.message).toMatch(/multipart\/form-data/);
  });

  it("checks the permission before reading: reader 403, anonymous 401, GET 405", async () => {
    const png = await sharp({ create: { width: 20, height: 20, channels: 3, background: "#000" } })
      .png()
      .toBuffer();
    const rows = await ownRows();
    expect((await upload(reader, png)).status).toBe(403);
    expect((await upload(app.client(), png)).status).toBe(401);
    expect((await app.client().get("/api/media")).status).toBe(405);
    expect(await ownRows()).toBe(rows);
  });
});

describe("the multipart reader", () => {
  /** A multipart body streamed in 64 KB chunks, counting the bytes pulled from it. */
  function streamedRequest(total: number) {
    const boundary = "----torqueleaf-test-boundary";
    const head = Buffer.from(
      `--${boundary}\r\nContent-Disposition: form-data; name="file"; filename="big.jpg"\r\nContent-Type: image/jpeg\r\n\r\n`,
    );
    const chunk = Buffer.alloc(64 * 1024, 0x41);
    chunk[0] = 0xff;
    let sent = 0;
    const body = new ReadableStream<Uint8Array>({
      pull(controller) {
        if (sent === 0) controller.enqueue(head);
        if (sent >= total) {
          controller.enqueue(Buffer.from(`\r\n--${boundary}--\r\n`));
          controller.close();
          return;
        }
        const part = Buffer.from(chunk);
        if (sent === 0) part.set([0xff, 0xd8, 0xff, 0xe0], 0);
        controller.enqueue(part);
        sent += part.length;
      },
    });
    const request = new Request("http://localhost/api/media", {
      method: "POST",
      headers: { "content-type": `multipart/form-data; boundary=${boundary}` },
      body,
      duplex: "half",
    } as RequestInit);
    return { request, sent: () => sent };
  }

  it("stops reading at 25 MB and answers 413 (RFC 9110 §15.5.14)", async () => {
    const total = 40 * 1024 * 1024;
    const { request, sent } = streamedRequest(total);
    await expect(readPhotoUpload(request)).rejects.toMatchObject({ status: 413 });
    expect(sent()).toBeLessThan(27 * 1024 * 1024);
  });

  it("reads a file just under the limit whole", async () => {
    const { request } = streamedRequest(2 * 1024 * 1024);
    const upload = await readPhotoUpload(request);
    expect(upload.file.byteLength).toBe(2 * 1024 * 1024);
    expect(upload.filename).toBe("big.jpg");
  });
});

describe("sweepUnusedMedia", () => {
  it("removes an old photo no step uses, with its objects, and keeps one a draft uses", async () => {
    const make = (colour: string) =>
      sharp({ create: { width: 640, height: 480, channels: 3, background: colour } })
        .jpeg()
        .toBuffer();
    const unused = await upload(author, await make("#aa3311"), "unused.jpg");
    const used = await upload(author, await make("#11aa33"), "used.jpg");
    expect([unused.status, used.status]).toEqual([201, 201]);

    // The author's own new guide uses one of them in a step, through the authoring API.
    const created = await author.request("/api/guides", {
      method: "POST",
      headers: { "content-type": "application/json" },
      body: JSON.stringify({ title: "Sweep check bracket", summary: "", category: CATEGORIES[0], difficulty: 2, minutes: 30 }),
    });
    expect(created.status).toBe(201);
    const { id } = (await created.json()) as { id: number };
    const view = (await (await author.get(`/api/guides/${id}/draft`)).json()) as DraftView;
    const draft = {
      ...view.draft,
      steps: [
        {
          title: "Fit the bracket",
          body: { type: "doc", content: [{ type: "paragraph", content: [{ type: "text", text: "Hold it level." }] }] },
          photos: [{ mediaId: used.body.id, alt: "The bracket in place", caption: null }],
          callouts: [],
        },
      ],
    };
    const saved = await author.request(`/api/guides/${id}/draft`, {
      method: "PUT",
      headers: { "content-type": "application/json" },
      body: JSON.stringify(draft),
    });
    expect(saved.status, await saved.clone().text()).toBe(200);

    const db = await getDb();
    const twoDaysAgo = new Date(Date.now() - 2 * UNUSED_MEDIA_MAX_AGE_MS);
    await db
      .update(media)
      .set({ createdAt: twoDaysAgo })
      .where(inArray(media.id, [unused.body.id, used.body.id]));
    // A fresh unused upload is kept: it may be attached on the next autosave.
    const fresh = await upload(author, await make("#3311aa"), "fresh.jpg");

    const storage = getStorage();
    const removed = await sweepUnusedMedia(db, storage, { olderThanMs: UNUSED_MEDIA_MAX_AGE_MS });
    expect(removed).toContain(unused.body.id);
    expect(removed).not.toContain(used.body.id);
    expect(removed).not.toContain(fresh.body.id);
    const left = await db
      .select({ id: media.id })
      .from(media)
      .where(inArray(media.id, [unused.body.id, used.body.id, fresh.body.id]));
    expect(left.map((r) => r.id).sort()).toEqual([used.body.id, fresh.body.id].sort());

    const keys = await storage.list("photos/");
    const keyOf = (url: string) => url.replace(/^.*?\/media\//, "");
    for (const v of unused.body.variants) expect(keys).not.toContain(keyOf(v.url));
    for (const v of used.body.variants) expect(keys).toContain(keyOf(v.url));
  });
});

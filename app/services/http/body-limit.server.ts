import type { IncomingMessage, ServerResponse } from "node:http";

const KB = 1024;
const MB = 1024 * KB;

/**
 * The largest request body each address accepts, checked before anything parses it. The first
 * row whose method and path match wins; otherwise the body's type decides.
 */
export const BODY_LIMITS = {
  /**
   * `streams`: the route reads its body as it arrives with its own limits (busboy: one file, a few
   * parts, a byte cap), so it is passed through without being held here; only a declared length
   * over the limit is refused up front.
   */
  paths: [{ method: "POST", path: /^\/api\/media\/?$/, bytes: 25 * MB + 64 * KB, streams: true }] as {
    method: string;
    path: RegExp;
    bytes: number;
    streams?: boolean;
  }[],
  json: 1 * MB,
  form: 256 * KB,
  other: 256 * KB,
  /** Fields in one form (URL-encoded pairs or multipart parts). */
  fields: 1_000,
};

type Limit = { bytes: number; countFields?: (chunk: Buffer) => number; streams?: boolean };
type Refusal = { status: 413; code: "too-large" | "too-many-fields"; message: string };

const size = (bytes: number) => (bytes >= MB ? `${bytes / MB} MB` : `${bytes / KB} KB`);

/** Counts fields as the bytes go by: `&` separators, or multipart boundary lines (split chunks included). */
function fieldCounter(type: string): ((chunk: Buffer) => number) | undefined {
  if (type.startsWith("application/x-www-form-urlencoded")) {
    let fields = 1;
    return (chunk) => {
      for (let i = chunk.indexOf(0x26); i !== -1; i = chunk.indexOf(0x26, i + 1)) fields++;
      return fields;
    };
  }
  const boundary = type.startsWith("multipart/") ? /boundary=(?:"([^"]+)"|([^;\s]+))/i.exec(type) : null;
  if (!boundary) return undefined;
  const marker = Buffer.from(`--${boundary[1] ?? boundary[2]}`);
  let delimiters = 0;
  let tail = Buffer.alloc(0);
  return (chunk) => {
    const data = tail.length ? Buffer.concat([tail, chunk]) : chunk;
    let end = 0;
    for (let i = data.indexOf(marker); i !== -1; i = data.indexOf(marker, end)) {
      delimiters++;
      end = i + marker.length;
    }
    // Keep just enough to find a delimiter cut in two, never part of one already counted.
    tail = Buffer.from(data.subarray(Math.max(end, data.length - marker.length + 1)));
    // The closing delimiter ends the last part.
    return delimiters - 1;
  };
}

/** Whether the route reads its body as a stream with its own limits (see `BODY_LIMITS.paths`). */
export function streamsBody(method: string, path: string): boolean {
  return BODY_LIMITS.paths.some((r) => r.streams && r.method === method && r.path.test(path));
}

export function bodyLimitFor(method: string, path: string, type: string): Limit {
  const row = BODY_LIMITS.paths.find((r) => r.method === method && r.path.test(path));
  const countFields = fieldCounter(type);
  const bytes =
    row?.bytes ?? (type.startsWith("application/json") ? BODY_LIMITS.json : countFields ? BODY_LIMITS.form : BODY_LIMITS.other);
  return { bytes, countFields: row?.streams ? undefined : countFields, streams: row?.streams };
}

/**
 * Reads the body up to its limit and, when it is within, gives it back to the request unread for
 * the app. Resolves with the refusal when the body breaks a limit, or "gone" when the client left.
 */
function readWithin(req: IncomingMessage, limit: Limit, tooLarge: Refusal): Promise<"ok" | "gone" | Refusal> {
  return new Promise((resolve) => {
    const chunks: Buffer[] = [];
    let bytes = 0;
    const finish = (outcome: "ok" | "gone" | Refusal) => {
      req.off("readable", onReadable);
      req.off("error", onGone);
      if (outcome === "ok") req.unshift(Buffer.concat(chunks));
      resolve(outcome);
    };
    const onGone = () => finish("gone");
    const onReadable = () => {
      for (let chunk: Buffer | null = req.read(); chunk !== null; chunk = req.read()) {
        bytes += chunk.length;
        if (bytes > limit.bytes) return finish(tooLarge);
        if (limit.countFields && limit.countFields(chunk) > BODY_LIMITS.fields) {
          return finish({
            status: 413,
            code: "too-many-fields",
            message: `The form has more than ${BODY_LIMITS.fields} fields, the most one request may carry.`,
          });
        }
        chunks.push(chunk);
      }
      // The whole message is in: hand it back before the stream can announce its end.
      if (req.complete) finish("ok");
    };
    req.on("readable", onReadable);
    req.once("error", onGone);
  });
}

function refuse(req: IncomingMessage, res: ServerResponse, path: string, refusal: Refusal) {
  if (res.headersSent) return;
  const api = path === "/api" || path.startsWith("/api/");
  res.writeHead(refusal.status, {
    "content-type": api ? "application/json" : "text/html; charset=utf-8",
    "cache-control": "no-store",
    // The rest of the body is not wanted: end the connection instead of reading it.
    connection: "close",
  });
  res.end(
    api
      ? JSON.stringify({ error: { code: refusal.code, message: refusal.message } })
      : `<!doctype html><html lang="en"><head><meta charset="utf-8"><title>Request too large · Torqueleaf</title></head>` +
          `<body><h1>Request too large</h1><p>${refusal.message} Nothing was saved.</p>` +
          `<p>Go back to the page, shorten what you sent, and try again.</p></body></html>`,
  );
  // Discard whatever is still arriving until the connection closes.
  req.resume();
}

type Next = (error?: unknown) => void;

/**
 * Connect/Express middleware that refuses an oversized body (413) before the app parses any of
 * it: a declared Content-Length over the limit is answered at once; a body without one is counted
 * as it streams and cut off at the limit; forms are also held to a number of fields.
 */
export function bodyLimit() {
  return (req: IncomingMessage, res: ServerResponse, next: Next) => {
    const declared = req.headers["content-length"];
    const chunked = req.headers["transfer-encoding"] !== undefined;
    // No body, or (an empty chunked one) already read to its end.
    if ((!chunked && (declared === undefined || declared === "0")) || (req.complete && req.readableLength === 0)) {
      return next();
    }
    const path = (req.url ?? "/").split("?")[0];
    const type = (req.headers["content-type"] ?? "").toLowerCase();
    const limit = bodyLimitFor(req.method ?? "GET", path, type);
    const tooLarge: Refusal = {
      status: 413,
      code: "too-large",
      message: `The request body is larger than ${size(limit.bytes)}, the most this address accepts.`,
    };
    if (!chunked && Number(declared) > limit.bytes) return refuse(req, res, path, tooLarge);
    // Node's parser never reads past a declared length, so only forms (fields) and chunked bodies need counting.
    if (limit.streams || (!chunked && !limit.countFields)) return next();
    readWithin(req, limit, tooLarge).then((outcome) => {
      if (outcome === "ok") next();
      else if (outcome !== "gone") refuse(req, res, path, outcome);
    }, next);
  };
}

/** The same limit on Vite's development server (`npm run dev` and the integration tests' server). */
export function bodyLimitPlugin() {
  return {
    name: "torqueleaf-body-limit",
    configureServer(server: { middlewares: { use: (fn: ReturnType<typeof bodyLimit>) => void } }) {
      server.middlewares.use(bodyLimit());
    },
  };
}

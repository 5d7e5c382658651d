import { readdirSync } from "node:fs";
import { createServer, type IncomingMessage } from "node:http";
import compression from "compression";
import express from "express";
import { createRequestHandler } from "@react-router/express";
import { stampPeerAddress } from "~/services/auth/client-address.server";
import { bodyLimit } from "~/services/http/body-limit.server";
import { originFormTargets, refuseUnsupportedMethods } from "~/services/http/request-shape.server";
import { stampRequestKind } from "~/services/http/request-kind.server";
import { securityHeadersLayer } from "~/services/http/security-headers.server";
import { getDb } from "~/db/client.server";
import { sweepUnusedMedia } from "~/models/media.server";
import { startOutboxWorker } from "~/services/mail/outbox-worker.server";
import { getStorage } from "~/services/storage.server";
import { boot } from "./boot";

/**
 * Production-style server: the built app behind Express, after boot (fakes, migrations, demo data).
 * `--local-demo` (`npm start`) runs the stand-ins and the demo data unless the settings say otherwise.
 * `npm run build` bundles this file to plain JavaScript (build/cli/start.js), which `npm start` runs
 * with node alone; the tests may also run it through tsx.
 */
const { settings } = await boot({ localDemo: process.argv.includes("--local-demo") });

const app = express();
// Security headers on every answer, static files included, and 405 for methods the app never serves.
app.use(securityHeadersLayer());
app.use(refuseUnsupportedMethods());
app.use(originFormTargets());
app.disable("x-powered-by");
if (settings.TRUST_PROXY) app.set("trust proxy", 1);
// Oversized bodies are refused before anything reads them.
app.use(bodyLimit());
// The app sees Fetch requests without a socket; these headers (always overwritten) give it the
// peer's address and whether a document or a navigation's data is asked for.
app.use((req, _res, next) => {
  stampPeerAddress(req);
  stampRequestKind(req);
  next();
});
app.use(compression());
app.use("/assets", express.static("build/client/assets", { immutable: true, maxAge: "1y" }));
// The few names at the root of build/client (favicon, logo, robots.txt …): only a path under one of
// them is looked up on disk; a static handler for every path would stat each request's path first
// (2 % of the CPU of an API answer).
const rootNames = new Set(readdirSync("build/client").filter((name) => name !== "assets"));
const serveRootFile = express.static("build/client", { maxAge: "1h", index: false });
app.use((req, res, next) => (rootNames.has(req.path.split("/")[1] ?? "") ? serveRootFile(req, res, next) : next()));
// Imported once: a function here would run the module loader on every request.
const build = await import(new URL("../../build/server/index.js", import.meta.url).href);
// A reader page asked for with no cookie and no credentials, already answered for the same address
// under the content as it is now, is answered as it was, with a fresh nonce, before React Router
// runs: its loaders would give the same data (anonymous-answers.server.ts). Through Express, since
// the markup differs by its nonce and is compressed per answer. (A public API answer noted the same
// way is sent by the Node listener below, before Express.)
const notedAnswer = build.entry.module.notedAnswer as typeof import("../entry.server").notedAnswer;
// A GET that carries nothing of anybody and no body (a body goes through Express's size limit).
const mayBeNoted = (req: IncomingMessage) =>
  req.method === "GET" &&
  req.headers.cookie === undefined &&
  req.headers.authorization === undefined &&
  req.headers["transfer-encoding"] === undefined &&
  (req.headers["content-length"] ?? "0") === "0";
app.use((req, res, next) => {
  if (!mayBeNoted(req)) return next();
  notedAnswer(req.url, req.headers["if-none-match"]).then((answer) => {
    if (!answer) return next();
    res.statusCode = answer.status;
    // Through Express, as React Router's adapter sets them (a text type gets its charset).
    for (const [name, value] of answer.headers) res.set(name, value);
    res.end(answer.body ?? undefined);
  }, next);
});
app.use(createRequestHandler({ build }));

// A public API answer noted the same way has the same bytes for everyone: Node's server sends it
// before Express runs, so no middleware is spent on it. Anything not noted goes through Express.
const notedJson = build.entry.module.notedJson as typeof import("../entry.server").notedJson;
const node = createServer((req, res) => {
  if (!mayBeNoted(req)) return app(req, res);
  notedJson(req.url ?? "/", { ifNoneMatch: req.headers["if-none-match"], acceptEncoding: req.headers["accept-encoding"] }).then(
    (answer) => {
      if (!answer) return app(req, res);
      res.writeHead(answer.status, answer.headers);
      res.end(answer.body ?? undefined);
    },
    (error: unknown) => {
      console.error(error);
      app(req, res);
    },
  );
});

const listening = () =>
  console.log(`Torqueleaf is serving ${settings.APP_ORIGIN} (${settings.HOST || "every interface"}, port ${settings.PORT})`);
// HOST empty: every interface.
const server = settings.HOST ? node.listen(settings.PORT, settings.HOST, listening) : node.listen(settings.PORT, listening);
// Hourly: photos no draft uses for 24 h go, with their objects. Unref'd: it never keeps the process up.
setInterval(
  () =>
    getDb()
      .then((db) => sweepUnusedMedia(db, getStorage()))
      .catch((error) => console.error("media sweep failed:", error)),
  60 * 60 * 1000,
).unref();
// Sends the outbox's mail; woken by every change that writes some, and it picks up what a previous
// run left (a crash included).
const outbox = startOutboxWorker();
for (const signal of ["SIGINT", "SIGTERM"] as const) {
  process.once(signal, () => {
    server.close();
    // The send in progress may finish and be marked; a mail server that hangs does not hold the exit up.
    const enough = new Promise((resolve) => setTimeout(resolve, 5000).unref());
    void Promise.race([outbox.stop(), enough]).finally(() => process.exit(0));
  });
}

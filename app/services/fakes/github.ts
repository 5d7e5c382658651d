import { randomBytes } from "node:crypto";
import { createServer, type IncomingMessage } from "node:http";
import type { AddressInfo } from "node:net";

/** Invented test identities offered on the fake's authorize page. */
export const GITHUB_TEST_IDENTITIES = [
  {
    id: 710001,
    login: "wrench-owl",
    name: "Tove Arnesen",
    emails: [{ email: "tove.arnesen@example.test", primary: true, verified: true }],
  },
  {
    id: 710002,
    login: "dusty-relay",
    name: "Rune Halvorsen",
    emails: [{ email: "reader@torqueleaf.test", primary: true, verified: true }],
  },
  {
    id: 710003,
    login: "late-grommet",
    name: "Pia Sundqvist",
    emails: [{ email: "author@torqueleaf.test", primary: true, verified: false }],
  },
] as const;

type Identity = (typeof GITHUB_TEST_IDENTITIES)[number];

function readBody(req: IncomingMessage): Promise<string> {
  return new Promise((resolve, reject) => {
    let data = "";
    req.on("data", (chunk) => {
      data += chunk;
    });
    req.on("end", () => resolve(data));
    req.on("error", reject);
  });
}

const escapeHtml = (s: string) =>
  s.replace(/[&<>"']/g, (c) => ({ "&": "&amp;", "<": "&lt;", ">": "&gt;", '"': "&quot;", "'": "&#39;" })[c] ?? c);

/**
 * A stand-in for GitHub's OAuth web flow and the two API calls sign-in needs, on 127.0.0.1.
 * Paths follow GitHub's (`/login/oauth/authorize`, `/login/oauth/access_token`, `/user`, `/user/emails`).
 */
export async function startGitHubFake(options: { port: number; clientId: string; clientSecret: string }) {
  const codes = new Map<string, Identity>();
  const tokens = new Map<string, Identity>();

  const server = createServer(async (req, res) => {
    const url = new URL(req.url ?? "/", "http://127.0.0.1");
    const json = (status: number, body: unknown) => {
      res.writeHead(status, { "content-type": "application/json" });
      res.end(JSON.stringify(body));
    };

    if (url.pathname === "/login/oauth/authorize" && req.method === "GET") {
      const redirectUri = url.searchParams.get("redirect_uri") ?? "";
      const state = url.searchParams.get("state") ?? "";
      if (url.searchParams.get("client_id") !== options.clientId || !redirectUri) {
        res.writeHead(400, { "content-type": "text/plain" }).end("Unknown client_id or missing redirect_uri");
        return;
      }
      const buttons = GITHUB_TEST_IDENTITIES.map(
        (who) => `<form method="post" action="/login/oauth/authorize">
          <input type="hidden" name="redirect_uri" value="${escapeHtml(redirectUri)}">
          <input type="hidden" name="state" value="${escapeHtml(state)}">
          <input type="hidden" name="identity" value="${who.id}">
          <button type="submit">Continue as ${escapeHtml(who.name)} (${escapeHtml(who.login)}, ${escapeHtml(who.emails[0].email)}${who.emails[0].verified ? "" : ", unverified"})</button>
        </form>`,
      ).join("\n");
      res.writeHead(200, { "content-type": "text/html; charset=utf-8" });
      res.end(`<!doctype html><html lang="en"><head><meta charset="utf-8"><title>Local OAuth provider</title>
        <style>body{font:16px system-ui;margin:3rem auto;max-width:36rem}button{display:block;width:100%;margin:.5rem 0;padding:.75rem;text-align:left}</style>
        </head><body><h1>Local OAuth provider (development only)</h1><p>Pick a test identity to sign in with.</p>${buttons}</body></html>`);
      return;
    }

    if (url.pathname === "/login/oauth/authorize" && req.method === "POST") {
      const form = new URLSearchParams(await readBody(req));
      const who = GITHUB_TEST_IDENTITIES.find((i) => String(i.id) === form.get("identity"));
      const target = new URL(form.get("redirect_uri") ?? "");
      if (!who) return json(400, { error: "unknown identity" });
      const code = randomBytes(16).toString("hex");
      codes.set(code, who);
      target.searchParams.set("code", code);
      target.searchParams.set("state", form.get("state") ?? "");
      res.writeHead(302, { location: target.toString() }).end();
      return;
    }

    if (url.pathname === "/login/oauth/access_token" && req.method === "POST") {
      const raw = await readBody(req);
      const form = new URLSearchParams(raw);
      const basic = req.headers.authorization?.startsWith("Basic ")
        ? Buffer.from(req.headers.authorization.slice(6), "base64").toString().split(":")
        : [form.get("client_id"), form.get("client_secret")];
      const who = codes.get(form.get("code") ?? "");
      if (basic[0] !== options.clientId || basic[1] !== options.clientSecret) {
        return json(401, { error: "incorrect_client_credentials" });
      }
      if (!who) return json(400, { error: "bad_verification_code" });
      codes.delete(form.get("code") ?? "");
      const token = randomBytes(20).toString("hex");
      tokens.set(token, who);
      return json(200, { access_token: token, token_type: "bearer", scope: "read:user,user:email" });
    }

    const who = tokens.get(req.headers.authorization?.replace(/^(Bearer|token) /i, "") ?? "");
    if (url.pathname === "/user" || url.pathname === "/user/emails") {
      if (!who) return json(401, { message: "Requires authentication" });
      if (url.pathname === "/user") {
        return json(200, { id: who.id, login: who.login, name: who.name, email: who.emails[0].email });
      }
      return json(200, who.emails);
    }
    json(404, { message: "Not Found" });
  });

  await new Promise<void>((resolve, reject) => {
    server.once("error", reject);
    server.listen(options.port, "127.0.0.1", () => resolve());
  });
  const address = server.address() as AddressInfo;
  return {
    url: `http://127.0.0.1:${address.port}`,
    stop: () => new Promise<void>((resolve) => server.close(() => resolve())),
  };
}

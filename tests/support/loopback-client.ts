import { request as httpRequest } from "node:http";
import { TestClient } from "./http-client";

/**
 * A TestClient whose connections leave from a chosen loopback address (127.0.0.2, 127.0.0.3 …),
 * so the app, which reads the peer address from the socket, sees it as another client. Node's
 * fetch cannot pick a local address without an extra dependency; node:http can (`localAddress`).
 */
export class LoopbackClient extends TestClient {
  constructor(
    origin: string,
    readonly localAddress: string,
  ) {
    super(origin);
    if (!/^127\.\d{1,3}\.\d{1,3}\.\d{1,3}$/.test(localAddress)) throw new Error(`not a loopback address: ${localAddress}`);
  }

  private keep(setCookies: string[]) {
    for (const line of setCookies) {
      const [pair, ...attributes] = line.split(";");
      const eq = pair.indexOf("=");
      const name = pair.slice(0, eq).trim();
      const value = pair.slice(eq + 1).trim();
      const expired = attributes.some((a) => /^\s*max-age=0\s*$/i.test(a)) || value === "";
      if (expired) this.cookies.delete(name);
      else this.cookies.set(name, value);
    }
  }

  override async request(path: string, init: RequestInit & { origin?: string | null } = {}): Promise<Response> {
    const headers = new Headers(init.headers);
    if (this.cookies.size && !headers.has("cookie")) headers.set("cookie", this.cookieHeader());
    const method = (init.method ?? "GET").toUpperCase();
    if (method !== "GET" && init.origin !== null && !headers.has("origin")) headers.set("origin", init.origin ?? this.origin);
    let body: string | undefined;
    if (init.body instanceof URLSearchParams) {
      body = init.body.toString();
      headers.set("content-type", "application/x-www-form-urlencoded;charset=UTF-8");
    } else if (typeof init.body === "string") {
      body = init.body;
    } else if (init.body != null) {
      throw new Error("LoopbackClient sends only form or string bodies");
    }
    if (body !== undefined) headers.set("content-length", String(Buffer.byteLength(body)));
    const url = new URL(path.startsWith("http") ? path : `${this.origin}${path}`);
    // The app server listens on 127.0.0.1; "localhost" is only its name in the Host header.
    const host = url.hostname === "localhost" ? "127.0.0.1" : url.hostname;
    if (!/^127\./.test(host)) throw new Error(`LoopbackClient talks only to loopback servers, not ${host}`);

    const { status, headerPairs, text } = await new Promise<{ status: number; headerPairs: [string, string][]; text: Buffer }>(
      (resolve, reject) => {
        const req = httpRequest(
          {
            host,
            port: url.port,
            path: `${url.pathname}${url.search}`,
            method,
            localAddress: this.localAddress,
            headers: { ...Object.fromEntries(headers), host: url.host },
          },
          (res) => {
            const chunks: Buffer[] = [];
            res.on("data", (chunk: Buffer) => chunks.push(chunk));
            res.on("end", () => {
              const pairs: [string, string][] = [];
              for (let i = 0; i < res.rawHeaders.length; i += 2) pairs.push([res.rawHeaders[i], res.rawHeaders[i + 1]]);
              resolve({ status: res.statusCode ?? 0, headerPairs: pairs, text: Buffer.concat(chunks) });
            });
            res.on("error", reject);
          },
        );
        req.on("error", reject);
        req.end(body);
      },
    );
    const responseHeaders = new Headers();
    for (const [name, value] of headerPairs) responseHeaders.append(name, value);
    const nullBody = status === 204 || status === 304 || (status >= 300 && status < 400 && text.length === 0);
    const response = new Response(nullBody ? null : new Uint8Array(text), { status, headers: responseHeaders });
    this.keep(response.headers.getSetCookie());
    return response;
  }
}

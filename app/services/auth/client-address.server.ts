import type { IncomingMessage } from "node:http";
import { stampRequestKind } from "~/services/http/request-kind.server";

/**
 * The address of the peer that opened the connection. Our servers (app/cli/start.ts and the dev
 * server) overwrite this header on every request with the socket's address, so a client cannot
 * choose it; the Fetch request the app sees carries no socket otherwise.
 */
export const PEER_ADDRESS_HEADER = "x-torqueleaf-peer-address";

export function stampPeerAddress(req: IncomingMessage) {
  req.headers[PEER_ADDRESS_HEADER] = req.socket.remoteAddress ?? "unknown";
}

/**
 * The client's address for abuse limits. `X-Forwarded-For` is believed only behind our one
 * configured proxy (TRUST_PROXY=1), and then only its last entry, the one that proxy added.
 */
export function clientAddress(request: Request, trustProxy: boolean): string {
  if (trustProxy) {
    const forwarded = request.headers.get("x-forwarded-for");
    const last = forwarded?.split(",").at(-1)?.trim();
    if (last) return last;
  }
  return request.headers.get(PEER_ADDRESS_HEADER) ?? "unknown";
}

/**
 * A Vite plugin that stamps the peer address and the request kind (request-kind.server.ts) before
 * React Router's dev handler sees the request.
 */
export function peerAddressPlugin() {
  return {
    name: "torqueleaf-peer-address",
    configureServer(server: {
      middlewares: { use: (fn: (req: IncomingMessage, res: unknown, next: () => void) => void) => void };
    }) {
      server.middlewares.use((req, _res, next) => {
        stampPeerAddress(req);
        stampRequestKind(req);
        next();
      });
    },
  };
}

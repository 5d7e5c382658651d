import { createServer } from "node:http";
import type { AddressInfo } from "node:net";
import { simpleParser } from "mailparser";
import { SMTPServer } from "smtp-server";

export type CaughtMail = {
  id: number;
  from: string;
  to: string[];
  subject: string;
  text: string;
  html: string;
  /** The header fields a test may check that the parsed parts do not show (List-Unsubscribe …), by lower-case name. */
  headers: Record<string, string>;
  receivedAt: string;
};

const KEPT_HEADERS = new Set(["list-unsubscribe", "list-unsubscribe-post", "message-id"]);

/**
 * An SMTP catcher: accepts every message on 127.0.0.1 and keeps the last few hundred in memory,
 * readable as JSON over HTTP (`GET /messages`, `DELETE /messages`) by the dev inbox and the tests.
 */
export async function startMailFake(options: { smtpPort: number; httpPort: number }) {
  const messages: CaughtMail[] = [];
  let nextId = 1;

  const smtp = new SMTPServer({
    authOptional: true,
    disabledCommands: ["STARTTLS"],
    logger: false,
    onData(stream, session, callback) {
      simpleParser(stream)
        .then((parsed) => {
          messages.unshift({
            id: nextId++,
            from: parsed.from?.text ?? "",
            to: session.envelope.rcptTo.map((r) => r.address),
            subject: parsed.subject ?? "",
            text: parsed.text ?? "",
            html: typeof parsed.html === "string" ? parsed.html : "",
            headers: Object.fromEntries(
              parsed.headerLines
                .filter((h) => KEPT_HEADERS.has(h.key))
                .map((h) => [h.key, h.line.slice(h.line.indexOf(":") + 1).trim()]),
            ),
            receivedAt: new Date().toISOString(),
          });
          messages.length = Math.min(messages.length, 500);
          callback();
        })
        .catch(callback);
    },
  });
  await new Promise<void>((resolve, reject) => {
    smtp.once("error", reject);
    smtp.listen(options.smtpPort, "127.0.0.1", () => resolve());
  });

  const http = createServer((req, res) => {
    if (req.url === "/messages" && req.method === "GET") {
      res.writeHead(200, { "content-type": "application/json" });
      res.end(JSON.stringify({ messages }));
    } else if (req.url === "/messages" && req.method === "DELETE") {
      messages.length = 0;
      res.writeHead(204).end();
    } else {
      res.writeHead(404).end();
    }
  });
  await new Promise<void>((resolve, reject) => {
    http.once("error", reject);
    http.listen(options.httpPort, "127.0.0.1", () => resolve());
  });

  const smtpAddress = smtp.server.address() as AddressInfo;
  const httpAddress = http.address() as AddressInfo;
  return {
    smtpPort: smtpAddress.port,
    inboxUrl: `http://127.0.0.1:${httpAddress.port}`,
    stop: async () => {
      await new Promise<void>((resolve) => smtp.close(() => resolve()));
      await new Promise<void>((resolve) => http.close(() => resolve()));
    },
  };
}

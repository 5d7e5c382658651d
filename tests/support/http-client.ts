import { Agent } from "undici";

// One connection pool per local address, shared by the clients of a test file.
const agents = new Map<string, Agent>();
const agentFor = (localAddress: string) => {
  const agent = agents.get(localAddress) ?? new Agent({ localAddress });
  agents.set(localAddress, agent);
  return agent;
};

/**
 * A minimal browser for integration tests: keeps cookies, sends our Origin on writes (as a
 * browser does for forms), never follows redirects, so each hop can be checked.
 *
 * `localAddress` (any of 127.0.0.0/8) makes it connect from that address, so the server sees
 * another client: abuse limits count per client address, taken from the socket.
 */
export class TestClient {
  readonly cookies = new Map<string, string>();
  private readonly dispatcher: Agent | undefined;

  constructor(
    readonly origin: string,
    readonly options: { localAddress?: string } = {},
  ) {
    this.dispatcher = options.localAddress ? agentFor(options.localAddress) : undefined;
  }

  cookieHeader() {
    return [...this.cookies].map(([k, v]) => `${k}=${v}`).join("; ");
  }

  private remember(response: Response) {
    for (const line of response.headers.getSetCookie()) {
      const [pair, ...attributes] = line.split(";");
      const eq = pair.indexOf("=");
      const name = pair.slice(0, eq).trim();
      const value = pair.slice(eq + 1).trim();
      const expired = attributes.some((a) => /^\s*max-age=0\s*$/i.test(a)) || value === "";
      if (expired) this.cookies.delete(name);
      else this.cookies.set(name, value);
    }
  }

  async request(path: string, init: RequestInit & { origin?: string | null } = {}) {
    const headers = new Headers(init.headers);
    if (this.cookies.size && !headers.has("cookie")) headers.set("cookie", this.cookieHeader());
    const method = (init.method ?? "GET").toUpperCase();
    if (method !== "GET" && init.origin !== null && !headers.has("origin")) headers.set("origin", init.origin ?? this.origin);
    const url = path.startsWith("http") ? path : `${this.origin}${path}`;
    // Node's fetch takes an undici dispatcher; the DOM types do not know the option.
    const response = await fetch(url, { ...init, headers, redirect: "manual", dispatcher: this.dispatcher } as RequestInit);
    this.remember(response);
    return response;
  }

  get(path: string, init: RequestInit = {}) {
    return this.request(path, init);
  }

  post(path: string, form: Record<string, string>, init: RequestInit & { origin?: string | null } = {}) {
    return this.request(path, { ...init, method: "POST", body: new URLSearchParams(form) });
  }

  async me() {
    const response = await this.get("/api/me");
    return (
      (await response.json()) as { user: null | { id: number; email: string; name: string; role: string; permissions: string[] } }
    ).user;
  }

  /** Signs in through the sign-in form; returns the response so callers can check where it went. */
  signIn(email: string, password: string, redirectTo?: string) {
    return this.post("/login", { email, password, ...(redirectTo !== undefined ? { redirectTo } : {}) });
  }
}

type CaughtMail = { id: number; to: string[]; subject: string; text: string; html: string };

/** The newest mail to `address` in the SMTP catcher (newer than `afterId` if given), waiting briefly for it to arrive. */
export async function latestMail(address: string, subject?: RegExp, afterId = 0): Promise<CaughtMail> {
  const deadline = Date.now() + 5000;
  for (;;) {
    const response = await fetch(`${process.env.MAIL_INBOX_URL}/messages`);
    const { messages } = (await response.json()) as { messages: CaughtMail[] };
    const found = messages.find(
      (m) => m.id > afterId && m.to.includes(address.toLowerCase()) && (!subject || subject.test(m.subject)),
    );
    if (found) return found;
    if (Date.now() > deadline) throw new Error(`no mail to ${address}${subject ? ` matching ${subject}` : ""}`);
    await new Promise((r) => setTimeout(r, 100));
  }
}

export async function mailsTo(address: string): Promise<CaughtMail[]> {
  const response = await fetch(`${process.env.MAIL_INBOX_URL}/messages`);
  const { messages } = (await response.json()) as { messages: CaughtMail[] };
  return messages.filter((m) => m.to.includes(address.toLowerCase()));
}

/** The path of the first link to this site in a mail's plain-text part. */
export function linkPath(mail: { text: string }, pattern: RegExp): string {
  const match = mail.text.match(pattern);
  if (!match) throw new Error(`no link matching ${pattern} in:\n${mail.text}`);
  return new URL(match[0]).pathname;
}

export const uniqueEmail = (label: string) =>
  `${label}-${Date.now().toString(36)}${Math.random().toString(36).slice(2, 6)}@example.test`;

/**
 * A change answered the browser way: a redirect to `to`, whose page shows the one-time message
 * once, and no longer after that.
 */
export async function expectFlash(client: TestClient, response: Response, to: string, text: string) {
  if (response.status !== 302) throw new Error(`expected a redirect, got ${response.status}: ${await response.text()}`);
  const location = response.headers.get("location") ?? "";
  if (new URL(location, client.origin).pathname !== to) throw new Error(`redirected to ${location}, not ${to}`);
  const page = await (await client.get(location)).text();
  if (!page.includes(text)) throw new Error(`the page after the change does not say "${text}"`);
  const again = await (await client.get(location)).text();
  if (again.includes(text)) throw new Error(`the message "${text}" showed a second time`);
}

/** A page's words: no markup, styles or scripts; the entities React writes decoded. */
export const plainText = (html: string) =>
  html
    .replace(/<(style|script)\b[^>]*>[\s\S]*?<\/\1>/g, " ")
    .replace(/<!--.*?-->/g, "")
    .replace(/<[^>]+>/g, " ")
    .replace(/&#x27;|&#39;/g, "'")
    .replace(/&quot;/g, '"')
    .replace(/&amp;/g, "&")
    .replace(/\s+/g, " ");

/** A client signed in with the given account (a demo account's password by default). */
export async function signedIn(origin: string, email: string, password = "torqueleaf-demo"): Promise<TestClient> {
  const client = new TestClient(origin);
  const response = await client.signIn(email, password);
  if (response.status !== 302) throw new Error(`could not sign in ${email}: ${response.status}`);
  return client;
}

import { readFileSync } from "node:fs";
import { connect } from "node:net";
import { afterEach, beforeAll, describe, expect, it } from "vitest";
import { TestClient, mailsTo } from "../support/http-client";
import { type BuiltApp, ensureBuild, sharedServices, startBuiltApp } from "./built-app";

const DEMO_PASSWORD = "torqueleaf-demo";
const SECRET = "a-long-production-secret-0123456789abcdef";
const PUBLIC_ORIGIN = "https://torqueleaf.example";

const started: BuiltApp[] = [];
async function start(...args: Parameters<typeof startBuiltApp>) {
  const app = await startBuiltApp(...args);
  started.push(app);
  return app;
}

beforeAll(ensureBuild, 240_000);
afterEach(async () => {
  await Promise.all(started.splice(0).map((app) => app.stop()));
});

/** Whether a TCP connection to this address is accepted. */
const accepts = (host: string, port: number) =>
  new Promise<boolean>((resolve) => {
    const socket = connect({ host, port });
    socket.once("connect", () => {
      socket.destroy();
      resolve(true);
    });
    socket.once("error", () => resolve(false));
  });

/** A start that must be refused: resolves with the exit code and what was printed. */
async function refusedStart(settings: Record<string, string>) {
  const app = await start(settings, { wait: false });
  const code = await Promise.race([
    app.exited,
    new Promise<"still running">((r) => setTimeout(() => r("still running"), 20_000)),
  ]);
  return { code, output: app.output() };
}

describe("a production start with the defaults", () => {
  it("runs no stand-ins and creates no demo accounts, so the published admin password and the mailed links stay private", async () => {
    // Real services for this app: the run's shared S3 store and mail server.
    const app = await start(
      { ...sharedServices(), NODE_ENV: "production", APP_ORIGIN: PUBLIC_ORIGIN, SESSION_SECRET: SECRET, HOST: "127.0.0.1" },
      { database: "empty" },
    );
    expect(app.output()).not.toMatch(/Local stand-ins/);
    expect(app.output()).not.toMatch(/demo scenario/);

    const attacker = new TestClient(app.url);
    const reset = await attacker.post("/reset", { email: "admin@torqueleaf.test" }, { origin: PUBLIC_ORIGIN });
    expect(reset.status).toBeLessThan(500);
    expect((await attacker.get("/dev/inbox")).status).toBe(404);
    expect((await attacker.get("/dev/inbox?format=json")).status).toBe(404);
    expect(await attacker.get("/").then((r) => r.text())).not.toContain('href="/dev/inbox"');
    // No account, so no reset mail reached the real mail server either.
    await new Promise((r) => setTimeout(r, 500));
    expect(await mailsTo("admin@torqueleaf.test").then((m) => m.filter((x) => x.text.includes("torqueleaf.example")))).toEqual(
      [],
    );

    const signIn = await attacker.signIn("admin@torqueleaf.test", DEMO_PASSWORD);
    expect(signIn.headers.get("location")).not.toBe("/");
    expect(await attacker.me()).toBeNull();
  });
});

describe("start-up refuses stand-ins and demo accounts where others can reach them", () => {
  const base = { NODE_ENV: "production", APP_ORIGIN: PUBLIC_ORIGIN, SESSION_SECRET: SECRET, HOST: "127.0.0.1" };
  const fakePorts = {
    S3_ENDPOINT: "http://127.0.0.1:0",
    SMTP_PORT: "0",
    MAIL_INBOX_URL: "http://127.0.0.1:0",
    GITHUB_BASE_URL: "http://127.0.0.1:0",
    GITHUB_API_URL: "http://127.0.0.1:0",
  };

  it("stops with a message naming the settings when LOCAL_FAKES=1 on a public origin", async () => {
    const { code, output } = await refusedStart({ ...base, ...fakePorts, LOCAL_FAKES: "1" });
    expect(code).not.toBe("still running");
    expect(code).not.toBe(0);
    expect(output).toMatch(/LOCAL_FAKES=1/);
    expect(output).toMatch(/ALLOW_STAND_INS_ON_PUBLIC_ORIGIN=1/);
  });

  it("stops when DEMO_DATA=1 on a public origin", async () => {
    const { code, output } = await refusedStart({ ...base, ...sharedServices(), DEMO_DATA: "1" });
    expect(code).not.toBe("still running");
    expect(code).not.toBe(0);
    expect(output).toMatch(/DEMO_DATA=1/);
    expect(output).toMatch(/ALLOW_STAND_INS_ON_PUBLIC_ORIGIN=1/);
  });

  it("stops when stand-ins would listen on every interface, even with a loopback origin", async () => {
    const { code, output } = await refusedStart({
      ...fakePorts,
      APP_ORIGIN: "http://localhost:3999",
      HOST: "0.0.0.0",
      LOCAL_FAKES: "1",
      DEMO_DATA: "0",
    });
    expect(code).not.toBe("still running");
    expect(code).not.toBe(0);
    expect(output).toMatch(/HOST=0\.0\.0\.0/);
    expect(output).toMatch(/ALLOW_STAND_INS_ON_PUBLIC_ORIGIN=1/);
  });
});

describe("LOCAL_FAKES=1 next to configured services", () => {
  it("never replaces an SMTP server on another host, and then shows no dev inbox", async () => {
    const app = await start(
      {
        NODE_ENV: "production",
        SESSION_SECRET: SECRET,
        LOCAL_FAKES: "1",
        DEMO_DATA: "0",
        // Configured, never contacted by this test (nothing sends mail here).
        SMTP_HOST: "smtp.example.test",
        SMTP_PORT: "587",
        S3_ENDPOINT: "http://127.0.0.1:0",
        GITHUB_BASE_URL: "http://127.0.0.1:0",
        GITHUB_API_URL: "http://127.0.0.1:0",
      },
      { database: "demo" },
    );
    const line = app.output().match(/Local stand-ins: .*/)?.[0] ?? "";
    expect(line).toMatch(/S3 http:\/\/127\.0\.0\.1:\d+/);
    expect(line).not.toMatch(/SMTP/);
    const client = new TestClient(app.url);
    expect((await client.get("/dev/inbox")).status).toBe(404);
    expect(await client.get("/").then((r) => r.text())).not.toContain('href="/dev/inbox"');
  });
});

describe("the address the server listens on", () => {
  it("is loopback (127.0.0.1) by default for a loopback origin, so other addresses are not answered", async () => {
    const app = await start(
      { ...sharedServices(), APP_ORIGIN: "http://localhost:3999", LOCAL_FAKES: "0", DEMO_DATA: "0" },
      { database: "demo" },
    );
    expect(await accepts("127.0.0.1", app.port)).toBe(true);
    // 127.0.0.2 is this machine too, but not the address HOST names.
    expect(await accepts("127.0.0.2", app.port)).toBe(false);
  });
});

describe("npm start", () => {
  it("runs the built app as plain JavaScript with React's production build and still starts the local demo", async () => {
    const script = JSON.parse(readFileSync("package.json", "utf8")).scripts.start as string;
    // "npm run build && NAME=value … node build/cli/start.js --flag": run what follows the build,
    // with node alone (no TypeScript loader at run time).
    const command = script.split("&&").at(-1)?.trim().split(/\s+/) ?? [];
    const assignments = Object.fromEntries(
      command.filter((w) => /^[A-Z_]+=/.test(w)).map((w) => w.split("=") as [string, string]),
    );
    expect(assignments.NODE_ENV).toBe("production");
    const program = command.findIndex((w) => !/^[A-Z_]+=/.test(w));
    expect(command[program]).toBe("node");
    expect(command.slice(program + 1).filter((w) => !w.startsWith("--"))).toEqual(["build/cli/start.js"]);
    const args = command.slice(command.indexOf("build/cli/start.js") + 1);
    const app = await start(
      {
        ...assignments,
        S3_ENDPOINT: "http://127.0.0.1:0",
        SMTP_PORT: "0",
        MAIL_INBOX_URL: "http://127.0.0.1:0",
        GITHUB_BASE_URL: "http://127.0.0.1:0",
        GITHUB_API_URL: "http://127.0.0.1:0",
      },
      { database: "demo", args },
    );
    expect(app.output()).toMatch(/Local stand-ins: S3 .*SMTP .*OAuth /);
    const client = new TestClient(`http://localhost:${app.port}`);
    expect((await client.get("/dev/inbox")).status).toBe(200);
    expect((await client.signIn("admin@torqueleaf.test", DEMO_PASSWORD)).status).toBe(302);
    expect((await client.me())?.role).toBe("admin");
  });
});

describe("the production server's body limit", () => {
  it("answers a 30 MB form with 413 while serving others", async () => {
    const app = await start({ ...sharedServices(), LOCAL_FAKES: "0", DEMO_DATA: "0" }, { database: "demo" });
    const origin = `http://localhost:${app.port}`;
    const headers = { "content-type": "application/x-www-form-urlencoded", origin };
    const [big, other] = await Promise.all([
      fetch(`${app.url}/login`, { method: "POST", headers, body: "a=&".repeat(10_000_000) }),
      new Promise((r) => setTimeout(r, 50)).then(() => fetch(`${app.url}/api/guides`)),
    ]);
    expect(big.status).toBe(413);
    expect(await big.text()).toMatch(/larger than 256 KB/);
    expect(other.status).toBe(200);

    // Without a declared length the server counts the bytes as they come and answers once they pass
    // the limit: this body sends 300 KB and then never ends, so only an early answer can arrive.
    let pulls = 0;
    const endless = new ReadableStream<Uint8Array>({
      pull(controller) {
        if (pulls++ > 0) return new Promise<void>(() => {});
        controller.enqueue(new TextEncoder().encode(`a=${"x".repeat(300_000)}`));
      },
    });
    const refused = await fetch(`${app.url}/login`, { method: "POST", headers, body: endless, duplex: "half" } as RequestInit);
    expect(refused.status).toBe(413);
    expect(await refused.text()).toMatch(/larger than 256 KB/);
    await endless.cancel().catch(() => {});
  });
});

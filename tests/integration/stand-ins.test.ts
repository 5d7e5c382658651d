import { afterAll, beforeAll, describe, expect, it, vi } from "vitest";
import { startLocalFakes } from "~/services/fakes";
import { TMP_DIR } from "../support/base-db";
import { type BuiltApp, ensureBuild, startBuiltApp } from "./built-app";

/**
 * A multipart body whose first header line starts with a space: a folded continuation line (RFC
 * 5322 section 2.2.3) with nothing before it to continue. The multipart parser under s3rver 3.x
 * threw on it from an event handler, which ended the whole process.
 */
const BOUNDARY = "----torqueleaf-stand-in-check";
const MALFORMED = `--${BOUNDARY}\r\n Content-Disposition: form-data; name="key"\r\n\r\n\r\n--${BOUNDARY}--`;

const answers = (url: string) =>
  fetch(url).then(
    (r) => r.status,
    () => 0,
  );

describe("the local S3 stand-in cannot take the app down", () => {
  let app: BuiltApp;
  beforeAll(async () => {
    await ensureBuild();
    app = await startBuiltApp(
      {
        LOCAL_FAKES: "1",
        DEMO_DATA: "0",
        S3_ENDPOINT: "http://127.0.0.1:0",
        SMTP_PORT: "0",
        MAIL_INBOX_URL: "http://127.0.0.1:0",
        GITHUB_BASE_URL: "http://127.0.0.1:0",
        GITHUB_API_URL: "http://127.0.0.1:0",
      },
      { database: "demo" },
    );
  }, 240_000);
  afterAll(async () => app?.stop());

  it("keeps answering after a malformed multipart POST to the stand-in's port", async () => {
    const s3 = app.output().match(/S3 (http:\/\/127\.0\.0\.1:\d+)/)?.[1];
    expect(s3).toBeDefined();
    const response = await fetch(`${s3}/torqueleaf-media`, {
      method: "POST",
      headers: { "content-type": `multipart/form-data; boundary=${BOUNDARY}` },
      body: MALFORMED,
    }).catch(() => undefined);
    // Refused as bad input (or the connection dropped), never a crash of the app.
    if (response) expect(response.status).toBeGreaterThanOrEqual(400);
    await new Promise((r) => setTimeout(r, 500));
    expect(await answers(`${app.url}/api/guides`)).toBe(200);
    expect(await answers(`${s3}/`)).toBeGreaterThan(0);
  });
});

describe("the stand-ins' own process", () => {
  it("is started again on the same ports when it dies, while the process that started them carries on", async () => {
    const logged: string[] = [];
    vi.mocked(console.error).mockImplementation((...args: unknown[]) => {
      logged.push(args.join(" "));
    });
    const fakes = await startLocalFakes({
      directory: `${TMP_DIR}/stand-ins-s3`,
      bucket: "torqueleaf-restart",
      s3Port: 0,
      smtpPort: 0,
      inboxPort: 0,
      githubPort: 0,
      githubClientId: "torqueleaf-test",
      githubClientSecret: "torqueleaf-test-secret",
    });
    try {
      const first = fakes.pid();
      expect(first).toBeDefined();
      expect(await answers(`${fakes.settings.MAIL_INBOX_URL}/messages`)).toBe(200);
      process.kill(first as number, "SIGKILL");
      const deadline = Date.now() + 30_000;
      while (fakes.pid() === first || (await answers(`${fakes.settings.MAIL_INBOX_URL}/messages`)) !== 200) {
        if (Date.now() > deadline) throw new Error(`the stand-ins did not come back:\n${logged.join("\n")}`);
        await new Promise((r) => setTimeout(r, 200));
      }
      expect(fakes.pid()).not.toBe(first);
      expect(await answers(`${fakes.settings.S3_ENDPOINT}/`)).toBeGreaterThan(0);
      expect(logged.join("\n")).toMatch(/stand-ins stopped \(SIGKILL\); starting them again/);
    } finally {
      await fakes.stop();
    }
  });
});

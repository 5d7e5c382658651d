import { startGitHubFake } from "./github";
import { startMailFake } from "./mail";
import { startS3Fake } from "./s3";

export type FakeOptions = {
  /** Folder for the S3 store's files. */
  directory: string;
  bucket: string;
  s3Port: number;
  smtpPort: number;
  inboxPort: number;
  githubPort: number;
  githubClientId: string;
  githubClientSecret: string;
};

export type LocalFakes = Awaited<ReturnType<typeof startLocalFakes>>;

/**
 * Starts the local stand-ins for S3, SMTP and GitHub on 127.0.0.1. Port 0 picks free ports;
 * the returned settings are what the app must be given to talk to them.
 */
export async function startLocalFakes(options: FakeOptions) {
  const s3 = await startS3Fake({ port: options.s3Port, directory: options.directory, bucket: options.bucket });
  const mail = await startMailFake({ smtpPort: options.smtpPort, httpPort: options.inboxPort });
  const github = await startGitHubFake({
    port: options.githubPort,
    clientId: options.githubClientId,
    clientSecret: options.githubClientSecret,
  });
  return {
    settings: {
      S3_ENDPOINT: s3.url,
      SMTP_HOST: "127.0.0.1",
      SMTP_PORT: String(mail.smtpPort),
      MAIL_INBOX_URL: mail.inboxUrl,
      GITHUB_BASE_URL: github.url,
      GITHUB_API_URL: github.url,
    },
    stop: async () => {
      await Promise.allSettled([s3.stop(), mail.stop(), github.stop()]);
    },
  };
}

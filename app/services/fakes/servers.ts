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
  /** Which stand-ins to start; all three when left out. */
  services?: { s3: boolean; mail: boolean; github: boolean };
};

/** Starts the chosen stand-ins in this process; the settings name their actual addresses. */
export async function startFakeServers(options: FakeOptions) {
  const wanted = options.services ?? { s3: true, mail: true, github: true };
  const settings: Record<string, string> = {};
  const stops: (() => Promise<void>)[] = [];
  try {
    if (wanted.s3) {
      const s3 = await startS3Fake({ port: options.s3Port, directory: options.directory, bucket: options.bucket });
      stops.push(s3.stop);
      settings.S3_ENDPOINT = s3.url;
    }
    if (wanted.mail) {
      const mail = await startMailFake({ smtpPort: options.smtpPort, httpPort: options.inboxPort });
      stops.push(mail.stop);
      Object.assign(settings, { SMTP_HOST: "127.0.0.1", SMTP_PORT: String(mail.smtpPort), MAIL_INBOX_URL: mail.inboxUrl });
    }
    if (wanted.github) {
      const github = await startGitHubFake({
        port: options.githubPort,
        clientId: options.githubClientId,
        clientSecret: options.githubClientSecret,
      });
      stops.push(github.stop);
      Object.assign(settings, { GITHUB_BASE_URL: github.url, GITHUB_API_URL: github.url });
    }
  } catch (error) {
    await Promise.allSettled(stops.map((stop) => stop()));
    throw error;
  }
  return {
    settings,
    stop: async () => {
      await Promise.allSettled(stops.map((stop) => stop()));
    },
  };
}

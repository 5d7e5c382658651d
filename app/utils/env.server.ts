import { existsSync } from "node:fs";
import { z } from "zod";

const flag = z.enum(["0", "1", "true", "false"]).transform((v) => v === "1" || v === "true");

/** 127.0.0.0/8, ::1 and `localhost` (with its subdomains, which resolve to loopback by RFC 6761). */
export function isLoopbackHost(host: string): boolean {
  const name = host.toLowerCase().replace(/^\[(.*)\]$/, "$1");
  return name === "localhost" || name.endsWith(".localhost") || name === "::1" || /^127(\.\d{1,3}){3}$/.test(name);
}

const isLoopbackUrl = (url: string) => isLoopbackHost(new URL(url).hostname);

/** Every setting with a safe local default; `.env.example` lists the same names. */
const envSchema = z
  .object({
    NODE_ENV: z.enum(["development", "production", "test"]).default("development"),
    PORT: z.coerce.number().int().min(0).max(65535).default(3000),
    /** The address the server listens on; empty = every interface. Default: loopback for a loopback APP_ORIGIN. */
    HOST: z.string().optional(),
    APP_ORIGIN: z.url().optional(),
    DATABASE_URL: z.string().min(1).default("file:./data/torqueleaf.db"),
    DATABASE_AUTH_TOKEN: z.string().optional(),
    SESSION_SECRET: z.string().min(16).default("local-development-secret-change-me"),
    S3_ENDPOINT: z.url().default("http://127.0.0.1:4569"),
    S3_REGION: z.string().default("us-east-1"),
    S3_BUCKET: z.string().min(3).default("torqueleaf-media"),
    S3_ACCESS_KEY_ID: z.string().default("S3RVER"),
    S3_SECRET_ACCESS_KEY: z.string().default("S3RVER"),
    S3_PUBLIC_URL: z.union([z.url(), z.literal("")]).default(""),
    SMTP_HOST: z.string().default("127.0.0.1"),
    SMTP_PORT: z.coerce.number().int().min(0).max(65535).default(1025),
    MAIL_FROM: z.string().default("Torqueleaf <no-reply@torqueleaf.test>"),
    MAIL_INBOX_URL: z.url().default("http://127.0.0.1:1080"),
    GITHUB_CLIENT_ID: z.string().default("torqueleaf-local"),
    GITHUB_CLIENT_SECRET: z.string().default("torqueleaf-local-secret"),
    GITHUB_BASE_URL: z.union([z.url(), z.literal("")]).default("http://127.0.0.1:4600"),
    GITHUB_API_URL: z.union([z.url(), z.literal("")]).default("http://127.0.0.1:4600"),
    TRUST_PROXY: flag.default(false),
    /** Default: on for a loopback APP_ORIGIN outside production, else off. */
    LOCAL_FAKES: flag.optional(),
    /** Where the local S3 stand-in keeps its files. */
    LOCAL_FAKES_DIR: z.string().default("./data"),
    /** Default: as LOCAL_FAKES. */
    DEMO_DATA: flag.optional(),
    /** Stand-ins and demo accounts on an origin or address others can reach are refused unless this is 1. */
    ALLOW_STAND_INS_ON_PUBLIC_ORIGIN: flag.default(false),
  })
  .transform((env) => {
    const APP_ORIGIN = env.APP_ORIGIN ?? `http://localhost:${env.PORT}`;
    const originHost = new URL(APP_ORIGIN).hostname;
    const loopbackOrigin = isLoopbackHost(originHost);
    const HOST = env.HOST ?? (loopbackOrigin ? (originHost === "[::1]" ? "::1" : "127.0.0.1") : "");
    const localByDefault = env.NODE_ENV !== "production" && loopbackOrigin;
    return {
      ...env,
      APP_ORIGIN,
      HOST,
      LOCAL_FAKES: env.LOCAL_FAKES ?? localByDefault,
      DEMO_DATA: env.DEMO_DATA ?? localByDefault,
    };
  });

export type Env = z.infer<typeof envSchema>;

/** Whether people other than this machine's can reach the app: a public origin, or listening beyond loopback. */
export function isPublic(settings: Pick<Env, "APP_ORIGIN" | "HOST">): boolean {
  return !isLoopbackUrl(settings.APP_ORIGIN) || settings.HOST === "" || !isLoopbackHost(settings.HOST);
}

function refusal(what: string, why: string, fix: string, settings: Env) {
  const where = `APP_ORIGIN=${settings.APP_ORIGIN} and HOST=${settings.HOST || "(every interface)"}`;
  return `${what} with ${where}: ${why} ${fix}, or set ALLOW_STAND_INS_ON_PUBLIC_ORIGIN=1 if others may really use them.`;
}

/** Refuses demo accounts where others can reach them, unless ALLOW_STAND_INS_ON_PUBLIC_ORIGIN=1. */
export function assertDemoAllowed(settings: Env, what = "DEMO_DATA=1", fix = "Set DEMO_DATA=0 for a real deployment") {
  if (isPublic(settings) && !settings.ALLOW_STAND_INS_ON_PUBLIC_ORIGIN) {
    throw new Error(refusal(what, "the demo accounts have a published password.", fix, settings));
  }
}

function parseSettings(source: NodeJS.ProcessEnv): Env {
  const result = envSchema.safeParse(source);
  if (!result.success) {
    const lines = result.error.issues.map((i) => `  ${i.path.join(".")}: ${i.message}`);
    throw new Error(`Invalid settings in the environment:\n${lines.join("\n")}`);
  }
  return result.data;
}

export function parseEnv(source: NodeJS.ProcessEnv): Env {
  const settings = parseSettings(source);
  if (settings.LOCAL_FAKES && isPublic(settings) && !settings.ALLOW_STAND_INS_ON_PUBLIC_ORIGIN) {
    const why = "the local stand-ins show every mailed sign-in and reset link at /dev/inbox.";
    throw new Error(refusal("LOCAL_FAKES=1", why, "Set LOCAL_FAKES=0 for a real deployment", settings));
  }
  if (settings.DEMO_DATA) assertDemoAllowed(settings);
  // The published development secret is tolerated only by a local demo nobody else can reach.
  const localDemo = !isPublic(settings) && (settings.LOCAL_FAKES || settings.DEMO_DATA);
  const productionLike = settings.NODE_ENV === "production" || isPublic(settings);
  if (productionLike && !localDemo && settings.SESSION_SECRET.startsWith("local-")) {
    throw new Error("SESSION_SECRET: set a secret of your own in production");
  }
  return settings;
}

/**
 * Which services the local stand-ins replace when LOCAL_FAKES=1: those whose settings name this
 * machine (the stand-in then listens at exactly that address, port 0 = a free port). A setting
 * naming another host is a real service and is used as given.
 */
export function standIns(settings: Env) {
  if (!settings.LOCAL_FAKES) return { s3: false, mail: false, github: false };
  return {
    s3: isLoopbackUrl(settings.S3_ENDPOINT),
    mail: isLoopbackHost(settings.SMTP_HOST) && isLoopbackUrl(settings.MAIL_INBOX_URL),
    github:
      settings.GITHUB_BASE_URL !== "" &&
      isLoopbackUrl(settings.GITHUB_BASE_URL) &&
      (settings.GITHUB_API_URL === "" || isLoopbackUrl(settings.GITHUB_API_URL)),
  };
}

let cached: Env | undefined;

function readEnvFile() {
  if (existsSync(".env") && process.env.NODE_ENV !== "test") {
    // Values already in the environment win over the file.
    process.loadEnvFile(".env");
  }
}

/** Parsed once per process; a bad value stops start-up with a message naming it. */
export function env(): Env {
  if (!cached) readEnvFile();
  cached ??= parseEnv(process.env);
  return cached;
}

/** Applies settings discovered at start-up (the stand-ins' ports) and parses again. */
export function updateEnv(values: Record<string, string>) {
  Object.assign(process.env, values);
  cached = undefined;
  return env();
}

/**
 * `npm start`: the local demo (stand-ins and demo data) unless the environment or `.env` sets
 * LOCAL_FAKES / DEMO_DATA, and only where nobody else can reach it. Written to the environment so
 * that the built app, which reads it again, agrees.
 */
export function preferLocalDemo() {
  readEnvFile();
  if (isPublic(parseSettings(process.env))) return;
  process.env.LOCAL_FAKES ??= "1";
  process.env.DEMO_DATA ??= "1";
  cached = undefined;
}

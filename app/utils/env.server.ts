import { existsSync } from "node:fs";
import { z } from "zod";

const flag = z.enum(["0", "1", "true", "false"]).transform((v) => v === "1" || v === "true");

/** Every setting with a safe local default; `.env.example` lists the same names. */
const envSchema = z
  .object({
    NODE_ENV: z.enum(["development", "production", "test"]).default("development"),
    PORT: z.coerce.number().int().min(0).max(65535).default(3000),
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
    LOCAL_FAKES: flag.default(true),
    /** Where the local S3 stand-in keeps its files. */
    LOCAL_FAKES_DIR: z.string().default("./data"),
    DEMO_DATA: flag.default(true),
  })
  .transform((env) => ({ ...env, APP_ORIGIN: env.APP_ORIGIN ?? `http://localhost:${env.PORT}` }));

export type Env = z.infer<typeof envSchema>;

export function parseEnv(source: NodeJS.ProcessEnv): Env {
  const result = envSchema.safeParse(source);
  if (!result.success) {
    const lines = result.error.issues.map((i) => `  ${i.path.join(".")}: ${i.message}`);
    throw new Error(`Invalid settings in the environment:\n${lines.join("\n")}`);
  }
  if (result.data.NODE_ENV === "production" && result.data.SESSION_SECRET.startsWith("local-")) {
    throw new Error("SESSION_SECRET: set a secret of your own in production");
  }
  return result.data;
}

let cached: Env | undefined;

/** Parsed once per process; a bad value stops start-up with a message naming it. */
export function env(): Env {
  if (!cached && existsSync(".env") && process.env.NODE_ENV !== "test") {
    // Values already in the environment win over the file.
    process.loadEnvFile(".env");
  }
  cached ??= parseEnv(process.env);
  return cached;
}

/** Applies settings discovered at start-up (the stand-ins' ports) and parses again. */
export function updateEnv(values: Record<string, string>) {
  Object.assign(process.env, values);
  cached = undefined;
  return env();
}

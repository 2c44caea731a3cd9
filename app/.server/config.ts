import { z } from "zod";

/**
 * Every setting the server reads, validated once at start. A bad or missing
 * value stops the process with a message naming the variable; secrets are
 * never echoed back.
 */
const schema = z.object({
  NODE_ENV: z.enum(["development", "production", "test"]).default("production"),
  DATABASE_URL: z.string().url({ message: "must be a postgres:// URL" }),
  APP_URL: z.string().url({ message: "must be the public base URL, e.g. https://sinewright.example.com" }).default("http://localhost:3000"),
  BETTER_AUTH_SECRET: z.string().min(32, { message: "must be at least 32 characters (generate one with `openssl rand -hex 32`)" }),
  TRUSTED_ORIGINS: z.string().default(""),
  SMTP_URL: z.string().url({ message: "must be an smtp:// or smtps:// URL" }).default("smtp://127.0.0.1:1025"),
  MAIL_FROM: z.string().default("Sinewright <no-reply@sinewright.invalid>"),
  MAIL_CATCHER_URL: z.string().url().optional(),
  TRUST_PROXY: z.string().default("loopback"),
  LOG_LEVEL: z.enum(["fatal", "error", "warn", "info", "debug", "trace", "silent"]).default("info"),
  DEV_PAGES: z.enum(["0", "1"]).default("0"),
  /** "off" only for test servers that sign in hundreds of times a minute from one address. */
  RATE_LIMITS: z.enum(["on", "off"]).default("on"),
  /** Meilisearch for large teams; unset, search runs on PostgreSQL alone. */
  MEILI_HOST: z.string().url({ message: "must be the Meilisearch URL, e.g. http://127.0.0.1:7700" }).optional(),
  MEILI_KEY: z.string().optional(),
  MEILI_INDEX: z.string().regex(/^[A-Za-z0-9_-]+$/, { message: "letters, digits, - and _ only" }).default("sinewright"),
  /** S3-compatible object store for attachments; unset, files go to STORAGE_DIR. */
  S3_ENDPOINT: z.string().url({ message: "must be the S3 endpoint URL, e.g. https://s3.eu-central-1.amazonaws.com or http://127.0.0.1:9000" }).optional(),
  S3_BUCKET: z.string().optional(),
  S3_ACCESS_KEY_ID: z.string().optional(),
  S3_SECRET_ACCESS_KEY: z.string().optional(),
  S3_REGION: z.string().default("us-east-1"),
  STORAGE_DIR: z.string().default(".data/attachments"),
  /** Largest attachment in MB (10^6 bytes). */
  ATTACHMENT_MAX_MB: z.coerce.number({ message: "must be a number of MB, e.g. 50" }).positive({ message: "must be more than 0" }).max(2000, { message: "must be at most 2000" }).default(50),
}).superRefine((cfg, ctx) => {
  if (!cfg.S3_ENDPOINT) return;
  for (const key of ["S3_BUCKET", "S3_ACCESS_KEY_ID", "S3_SECRET_ACCESS_KEY"] as const) {
    if (!cfg[key]) ctx.addIssue({ code: "custom", path: [key], message: "must be set when S3_ENDPOINT is set" });
  }
});

export type AppConfig = z.infer<typeof schema>;

let cached: AppConfig | undefined;

export function config(): AppConfig {
  if (cached) return cached;
  const parsed = schema.safeParse(process.env);
  if (!parsed.success) {
    const lines = parsed.error.issues.map((issue) => `  ${issue.path.join(".")}: ${issue.message}`);
    throw new Error(`Sinewright cannot start: fix these environment variables:\n${lines.join("\n")}`);
  }
  cached = parsed.data;
  return cached;
}

/** Origins allowed to post forms and call the auth API: the app URL plus any listed. */
export function trustedOrigins(): string[] {
  const cfg = config();
  const extra = cfg.TRUSTED_ORIGINS.split(",").map((s) => s.trim()).filter(Boolean);
  return [new URL(cfg.APP_URL).origin, ...extra];
}

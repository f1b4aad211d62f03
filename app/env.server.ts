import { availableParallelism } from "node:os";
import { z } from "zod";

/** Every setting Gatecrash reads, validated once at start-up. Defaults work for the local stack of `npm start`. */
const envSchema = z.object({
  NODE_ENV: z.enum(["development", "production", "test"]).default("development"),
  DATABASE_URL: z.string().url().default("postgres://gatecrash@127.0.0.1:54329/gatecrash"),
  APP_URL: z.string().url().default("http://127.0.0.1:3000"),
  BETTER_AUTH_SECRET: z.string().min(32).default("dev-only-secret-change-me-0123456789abcdef"),
  S3_ENDPOINT: z.string().url().default("http://127.0.0.1:4569"),
  S3_REGION: z.string().default("us-east-1"),
  S3_BUCKET: z.string().default("gatecrash"),
  S3_ACCESS_KEY_ID: z.string().default("S3RVER"),
  S3_SECRET_ACCESS_KEY: z.string().default("S3RVER"),
  SMTP_HOST: z.string().default("127.0.0.1"),
  SMTP_PORT: z.coerce.number().int().default(1025),
  /** none: the local catcher; starttls or tls: a real relay (app/mail/outbox.server.ts) */
  SMTP_SECURITY: z.enum(["none", "starttls", "tls"]).default("none"),
  SMTP_USER: z.string().default(""),
  SMTP_PASSWORD: z.string().default(""),
  MAIL_FROM: z.string().default("Gatecrash <no-reply@gatecrash.test>"),
  STRIPE_SECRET_KEY: z.string().default("sk_test_gatecrash_local"),
  STRIPE_WEBHOOK_SECRET: z.string().default("whsec_gatecrash_local_secret"),
  STRIPE_API_HOST: z.string().default("127.0.0.1"),
  STRIPE_API_PORT: z.coerce.number().int().default(12111),
  STRIPE_API_PROTOCOL: z.enum(["http", "https"]).default("http"),
  WORKDIR: z.string().default(".gatecrash/work"),
  /** Cookies get the Secure flag when the app is served over https. */
  TRUSTED_ORIGINS: z.string().default(""),
  AUTH_RATE_LIMIT: z.coerce.number().int().default(10),
  /** How long a check-run job may stay active before pg-boss hands it to another worker (a killed worker's job). */
  CHECK_RUN_EXPIRE_SECONDS: z.coerce.number().int().min(1).default(15 * 60),
  /** How often the supervising worker expires stalled jobs (pg-boss maintenance; its default is 120 s). */
  QUEUE_MAINTENANCE_SECONDS: z.coerce.number().int().min(1).default(120),
  /** Check runs one worker process runs at a time; default: one core left for the rest of the machine. */
  WORKER_CONCURRENCY: z.coerce.number().int().min(1).max(64).default(Math.max(1, availableParallelism() - 1)),
});

export type Env = z.infer<typeof envSchema>;

let cached: Env | undefined;

export function env(): Env {
  if (!cached) {
    const parsed = envSchema.safeParse(process.env);
    if (!parsed.success) {
      const lines = parsed.error.issues.map((i) => `  ${i.path.join(".")}: ${i.message}`).join("\n");
      throw new Error(`Gatecrash cannot start: invalid environment\n${lines}`);
    }
    cached = parsed.data;
  }
  return cached;
}

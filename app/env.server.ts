import { availableParallelism } from "node:os";
import { z } from "zod";

/** Every setting Gatecrash reads, validated once at start-up. Defaults work for the local stack of `npm start`. */
const envSchema = z.object({
  NODE_ENV: z.enum(["development", "production", "test"]).default("development"),
  DATABASE_URL: z.string().url().default("postgres://gatecrash@127.0.0.1:54329/gatecrash"),
  /** Connections of this process's pool; transactions may hold all but one of them at once. */
  DATABASE_POOL_MAX: z.coerce.number().int().min(2).max(200).default(10),
  /** PostgreSQL ends a statement that runs longer (statement_timeout). */
  DATABASE_STATEMENT_TIMEOUT_MS: z.coerce.number().int().min(100).default(15_000),
  /** PostgreSQL ends a session left idle inside a transaction longer (idle_in_transaction_session_timeout). */
  DATABASE_IDLE_IN_TRANSACTION_TIMEOUT_MS: z.coerce.number().int().min(100).default(10_000),
  /** How long a transaction waits for a free connection before the request is answered 503 with Retry-After. */
  DATABASE_ACQUIRE_TIMEOUT_MS: z.coerce.number().int().min(10).default(5_000),
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
  /** Failed sign-ins per account and client address in 10 minutes (app/auth/sign-in-limit.server.ts). */
  AUTH_RATE_LIMIT: z.coerce.number().int().min(1).default(10),
  /** Failed sign-ins per client address over all accounts in 10 minutes. */
  AUTH_ADDRESS_FAILURE_LIMIT: z.coerce.number().int().min(1).default(50),
  /**
   * The proxies in front of the web server, whose X-Forwarded-For is believed (comma-separated addresses or CIDR
   * ranges, or "loopback"). Empty: no proxy, the client is the socket's peer, and X-Forwarded-For is ignored.
   */
  TRUSTED_PROXIES: z
    .string()
    .default("")
    .transform((s) => s.split(",").map((p) => p.trim()).filter(Boolean))
    .pipe(z.array(z.union([z.ipv4(), z.ipv6(), z.cidrv4(), z.cidrv6(), z.literal("loopback")], { error: 'an IP address, a CIDR range or "loopback"' }))),
  /**
   * How long a check-run job may stay active before pg-boss hands it to another worker (a killed worker's job). 30 min: a
   * whole-demo capture of up to 600 s of picture (simulation.maxRunSeconds) at a few times real time, plus the build.
   */
  CHECK_RUN_EXPIRE_SECONDS: z.coerce.number().int().min(1).default(30 * 60),
  /** How often the supervising worker expires stalled jobs (pg-boss maintenance; its default is 120 s). */
  QUEUE_MAINTENANCE_SECONDS: z.coerce.number().int().min(1).default(120),
  /** Check runs one worker process runs at a time; default: one core left for the rest of the machine. */
  WORKER_CONCURRENCY: z.coerce.number().int().min(1).max(64).default(Math.max(1, availableParallelism() - 1)),
  /** Repository links to 127.0.0.0/8 and localhost: refused, except where a test serves its own repository on loopback. */
  REPOSITORY_FETCH_LOOPBACK: z.enum(["allow", "refuse"]).default("refuse"),
});

export type Env = z.infer<typeof envSchema>;

/**
 * Secrets: in production each must be set, and none may keep the development default committed in this file
 * (anyone who read the repository would know it). `npm start` and `npm test` generate their own (scripts/lib/secrets.ts).
 */
export const SECRET_VARIABLES = ["BETTER_AUTH_SECRET", "STRIPE_SECRET_KEY", "STRIPE_WEBHOOK_SECRET", "S3_ACCESS_KEY_ID", "S3_SECRET_ACCESS_KEY"] as const;

function secretProblems(source: Record<string, string | undefined>, parsed: Env): string[] {
  const defaults = envSchema.parse({});
  return SECRET_VARIABLES.flatMap((name) => {
    if (!source[name]) return [`  ${name}: not set (required in production)`];
    if (parsed[name] === defaults[name]) return [`  ${name}: still the development default from the repository; set a secret of your own`];
    return [];
  });
}

/** Validates settings from `source`; throws with one line per problem, each naming its variable. */
export function parseEnv(source: Record<string, string | undefined>): Env {
  const parsed = envSchema.safeParse(source);
  if (!parsed.success) {
    const lines = parsed.error.issues.map((i) => `  ${i.path.join(".")}: ${i.message}`).join("\n");
    throw new Error(`Gatecrash cannot start: invalid environment\n${lines}`);
  }
  if (parsed.data.NODE_ENV === "production") {
    const problems = secretProblems(source, parsed.data);
    if (problems.length) throw new Error(`Gatecrash cannot start in production: secrets are missing or left at their defaults\n${problems.join("\n")}`);
  }
  return parsed.data;
}

let cached: Env | undefined;

export function env(): Env {
  cached ??= parseEnv(process.env);
  return cached;
}

import { betterAuth } from "better-auth";
import { drizzleAdapter } from "better-auth/adapters/drizzle";
import { admin } from "better-auth/plugins";
import { db } from "~/db/client.server";
import { account, rateLimit, session, user, verification } from "~/db/schema";
import { env } from "~/env.server";
import { enqueueMail } from "~/mail/outbox.server";
import { resetPasswordMail, verifyEmailMail } from "~/mail/templates";

function createAuth() {
  const e = env();
  const secure = e.APP_URL.startsWith("https://");
  return betterAuth({
    appName: "Gatecrash",
    baseURL: e.APP_URL,
    secret: e.BETTER_AUTH_SECRET,
    trustedOrigins: [e.APP_URL, ...e.TRUSTED_ORIGINS.split(",").filter(Boolean)],
    database: drizzleAdapter(db(), { provider: "pg", schema: { user, session, account, verification, rateLimit } }),
    emailAndPassword: {
      enabled: true,
      requireEmailVerification: true,
      minPasswordLength: 10,
      sendResetPassword: async ({ user: u, url }) => {
        await enqueueMail(resetPasswordMail({ to: u.email, name: u.name, url }));
      },
    },
    emailVerification: {
      sendOnSignUp: true,
      autoSignInAfterVerification: true,
      sendVerificationEmail: async ({ user: u, url }) => {
        await enqueueMail(verifyEmailMail({ to: u.email, name: u.name, url }));
      },
    },
    rateLimit: {
      enabled: true,
      storage: "database",
      window: 60,
      max: 200,
      customRules: {
        "/sign-in/email": { window: 60, max: e.AUTH_RATE_LIMIT },
        "/sign-up/email": { window: 60, max: e.AUTH_RATE_LIMIT },
        "/request-password-reset": { window: 60, max: 5 },
      },
    },
    advanced: {
      useSecureCookies: secure,
      defaultCookieAttributes: { httpOnly: true, sameSite: "lax", secure },
    },
    plugins: [admin()],
  });
}

let instance: ReturnType<typeof createAuth> | undefined;

export function auth() {
  instance ??= createAuth();
  return instance;
}

export type AuthSession = NonNullable<Awaited<ReturnType<ReturnType<typeof auth>["api"]["getSession"]>>>;

import { betterAuth } from "better-auth";
import { drizzleAdapter } from "better-auth/adapters/drizzle";
import { admin } from "better-auth/plugins";
import { db } from "~/db/client.server";
import { account, rateLimit, session, user, verification } from "~/db/schema";
import { env } from "~/env.server";
import { enqueueMail } from "~/mail/outbox.server";
import { resetPasswordMail, verifyEmailMail } from "~/mail/templates";

/** The header our own code sets to the client address the production server determined; callers' copies are dropped. */
export const CLIENT_ADDRESS_HEADER = "x-gatecrash-client-address";

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
      // A reset after a compromise must also end the intruder's sessions.
      revokeSessionsOnPasswordReset: true,
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
        // A ceiling per address only: failed sign-ins are counted per account and address by the sign-in page
        // (app/auth/sign-in-limit.server.ts), and many honest people may share one party network's address.
        "/sign-in/email": { window: 60, max: 120 },
        "/sign-up/email": { window: 60, max: e.AUTH_RATE_LIMIT },
        "/request-password-reset": { window: 60, max: 5 },
      },
    },
    advanced: {
      // Set by our own code from the address the production server determined (app/auth/forward.server.ts).
      ipAddress: { ipAddressHeaders: [CLIENT_ADDRESS_HEADER] },
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

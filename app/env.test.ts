import { describe, expect, it } from "vitest";
import { parseEnv } from "./env.server";

/** The production secrets rule: every secret set, and none of them the development default from this repository. */
const STRONG = {
  BETTER_AUTH_SECRET: "a".repeat(20) + "9f3c2b7e1d8a4c6f5e0b",
  STRIPE_SECRET_KEY: "sk_live_9f3c2b7e1d8a4c6f5e0b",
  STRIPE_WEBHOOK_SECRET: "whsec_9f3c2b7e1d8a4c6f5e0b",
  S3_ACCESS_KEY_ID: "AKIA9F3C2B7E1D8A",
  S3_SECRET_ACCESS_KEY: "9f3c2b7e1d8a4c6f5e0b9f3c2b7e1d8a",
};

describe("settings in production", () => {
  it("refuse to start without the secrets, naming each missing variable", () => {
    expect(() => parseEnv({ NODE_ENV: "production" })).toThrow(/BETTER_AUTH_SECRET[\s\S]*STRIPE_SECRET_KEY[\s\S]*STRIPE_WEBHOOK_SECRET[\s\S]*S3_ACCESS_KEY_ID[\s\S]*S3_SECRET_ACCESS_KEY/);
  });

  it("refuse a secret left at the development default", () => {
    const dev = parseEnv({ NODE_ENV: "development" });
    for (const name of Object.keys(STRONG) as (keyof typeof STRONG)[]) {
      const e = { NODE_ENV: "production", ...STRONG, [name]: dev[name] };
      expect(() => parseEnv(e), name).toThrow(new RegExp(`${name}.*development default`));
    }
  });

  it("start with every secret set to a value of its own", () => {
    expect(parseEnv({ NODE_ENV: "production", ...STRONG }).BETTER_AUTH_SECRET).toBe(STRONG.BETTER_AUTH_SECRET);
  });

  it("keep the defaults for development and tests", () => {
    expect(parseEnv({ NODE_ENV: "test" }).STRIPE_WEBHOOK_SECRET).toMatch(/^whsec_/);
    expect(parseEnv({}).NODE_ENV).toBe("development");
  });
});

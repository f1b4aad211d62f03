import { spawn, spawnSync } from "node:child_process";
import { request as httpRequest } from "node:http";
import supertest from "supertest";
import { afterAll, describe, expect, it } from "vitest";
import { closeDb } from "~/db/client.server";
import { freePort, waitForPort } from "../../scripts/lib/ports";
import { builtListener } from "../security/listener";

/**
 * Gatecrash's own production server (server/): security headers and compression on static files too, the
 * production secrets rule at start, and a graceful stop on SIGTERM that lets a request in flight finish.
 * Header names and meanings: RFC 9110 (Content-Encoding § 8.4), the CSP Level 3 and Fetch standards (nosniff).
 */
const BUILD = () => process.env.GATECRASH_BUILD_DIR!;

afterAll(async () => {
  await closeDb();
});

describe("static files", () => {
  it("carry the security headers and are compressed", async () => {
    const app = await builtListener();
    const page = await supertest(app).get("/check-your-mail");
    const script = /\/assets\/[^"]+\.js/.exec(page.text)?.[0];
    expect(script).toBeTruthy();
    const res = await supertest(app).get(script!).set("Accept-Encoding", "gzip");
    expect(res.status).toBe(200);
    expect(res.headers["content-encoding"]).toBe("gzip");
    expect(res.headers["x-content-type-options"]).toBe("nosniff");
    expect(res.headers["content-security-policy"]).toMatch(/default-src 'self'/);
    expect(res.headers["x-frame-options"]).toBe("DENY");
    expect(res.headers["cache-control"]).toMatch(/immutable/);
    const icon = await supertest(app).get("/favicon.svg");
    expect(icon.status).toBe(200);
    expect(icon.headers["content-security-policy"]).toBeTruthy();
  });
});

describe("starting in production", () => {
  it("stops with a message naming each missing secret", () => {
    const env: NodeJS.ProcessEnv = { PATH: process.env.PATH, NODE_ENV: "production", DATABASE_URL: process.env.DATABASE_URL, PORT: "1" };
    const out = spawnSync(process.execPath, ["--import", "tsx", "server/main.ts", BUILD()], { env, encoding: "utf8", timeout: 60_000 });
    expect(out.status).toBe(1);
    for (const name of ["BETTER_AUTH_SECRET", "STRIPE_SECRET_KEY", "STRIPE_WEBHOOK_SECRET", "S3_ACCESS_KEY_ID", "S3_SECRET_ACCESS_KEY"]) expect(out.stderr).toContain(name);
  });
});

describe("SIGTERM", () => {
  it("finishes the request in flight, then closes the pool and exits 0", async () => {
    const port = await freePort();
    const child = spawn(process.execPath, ["--import", "tsx", "server/main.ts", BUILD()], { env: { ...process.env, NODE_ENV: "production", PORT: String(port) }, stdio: ["ignore", "pipe", "pipe"] });
    const output: string[] = [];
    child.stdout.on("data", (c: Buffer) => output.push(c.toString()));
    child.stderr.on("data", (c: Buffer) => output.push(c.toString()));
    const exited = new Promise<number | null>((resolve) => child.on("exit", (code) => resolve(code)));
    try {
      await waitForPort(port, 60_000);
      // A form post whose body is still arriving when the signal comes.
      const answered = new Promise<number>((resolve, reject) => {
        // Expect: 100-continue makes the server say when it has the request (RFC 9110 § 10.1.1), so the signal comes
        // while that request is in flight, not before the server has read it.
        const req = httpRequest(
          { host: "127.0.0.1", port, path: "/sign-in", method: "POST", headers: { origin: `http://127.0.0.1:${port}`, "content-type": "application/x-www-form-urlencoded", "transfer-encoding": "chunked", expect: "100-continue" } },
          (res) => {
            res.resume();
            resolve(res.statusCode ?? 0);
          },
        );
        req.on("error", reject);
        req.on("continue", () => {
          req.write("email=someone%40example.test&");
          child.kill("SIGTERM");
        });
        req.flushHeaders();
        const finish = () => req.end("password=not-the-password");
        // The server says it is stopping before the rest of the body goes out.
        const poll = setInterval(() => {
          if (output.join("").includes("SIGTERM")) {
            clearInterval(poll);
            finish();
          }
        }, 20);
      });
      expect(await answered).toBe(200);
      expect(await exited).toBe(0);
      expect(output.join("")).toMatch(/stopped/);
    } finally {
      if (child.exitCode === null) child.kill("SIGKILL");
    }
  }, 120_000);
});

import nodemailer from "nodemailer";
import { describe, expect, it } from "vitest";
import { smtpOptions } from "./outbox.server";

/**
 * The relay settings against a real SMTP server, the test stack's catcher (maildev): "none" delivers as in
 * development; "starttls" upgrades the connection (RFC 3207) and verifies the server's certificate before it sends
 * anything, credentials included — the catcher's own self-signed, expired test certificate is refused.
 */
const port = Number(process.env.SMTP_PORT ?? 1025);
const base = { SMTP_HOST: "127.0.0.1", SMTP_PORT: port, SMTP_USER: "", SMTP_PASSWORD: "" };
const mail = { from: "bench@gatecrash.test", to: "someone@example.test", subject: "relay settings", text: "hello" };

describe("SMTP relay settings", () => {
  it("sends in clear text to the local catcher when SMTP_SECURITY is none", async () => {
    const info = await nodemailer.createTransport(smtpOptions({ ...base, SMTP_SECURITY: "none" })).sendMail(mail);
    expect(info.accepted).toEqual(["someone@example.test"]);
  });

  it("sends nothing, credentials included, over a connection whose certificate does not verify when SMTP_SECURITY is starttls", async () => {
    const transport = nodemailer.createTransport(smtpOptions({ ...base, SMTP_SECURITY: "starttls", SMTP_USER: "crew", SMTP_PASSWORD: "secret" }));
    await expect(transport.sendMail(mail)).rejects.toThrow(/certificate|STARTTLS|TLS/i);
  });

  it("authenticates only when a user is set", () => {
    expect(smtpOptions({ ...base, SMTP_SECURITY: "tls" })).toMatchObject({ secure: true });
    expect("auth" in smtpOptions({ ...base, SMTP_SECURITY: "tls" })).toBe(false);
    expect(smtpOptions({ ...base, SMTP_SECURITY: "tls", SMTP_USER: "u", SMTP_PASSWORD: "p" }).auth).toEqual({ user: "u", pass: "p" });
  });
});

import { eq, and, lt, sql } from "drizzle-orm";
import nodemailer, { type Transporter } from "nodemailer";
import { db } from "~/db/client.server";
import { outbox } from "~/db/schema";
import { env } from "~/env.server";
import { queue, QUEUES } from "~/jobs/queue.server";
import type { Mail } from "./templates";

/**
 * Every mail is first a row in the outbox, then a job. A web request never waits for SMTP:
 * if the catcher is down, the job fails and pg-boss retries with backoff; a sweep re-queues stragglers.
 */
export async function enqueueMail(mail: Mail): Promise<string | null> {
  const [row] = await db()
    .insert(outbox)
    .values({ toAddress: mail.to, subject: mail.subject, textBody: mail.text, htmlBody: mail.html, dedupeKey: mail.dedupeKey })
    .onConflictDoNothing({ target: outbox.dedupeKey })
    .returning({ id: outbox.id });
  if (!row) return null; // already queued once under this dedupe key
  const boss = await queue();
  await boss.send(QUEUES.mail, { outboxId: row.id }, { retryLimit: 12, retryDelay: 5, retryBackoff: true });
  return row.id;
}

/**
 * nodemailer's options for the configured relay: the local catcher speaks plain SMTP; a real relay gets TLS from
 * the first byte ("tls", usually port 465) or after STARTTLS, which is then required ("starttls", usually 587),
 * so credentials never cross the network in clear text. SMTP_USER turns authentication on.
 */
export function smtpOptions(e: Pick<ReturnType<typeof env>, "SMTP_HOST" | "SMTP_PORT" | "SMTP_SECURITY" | "SMTP_USER" | "SMTP_PASSWORD">) {
  return {
    host: e.SMTP_HOST,
    port: e.SMTP_PORT,
    secure: e.SMTP_SECURITY === "tls",
    requireTLS: e.SMTP_SECURITY === "starttls",
    ignoreTLS: e.SMTP_SECURITY === "none",
    ...(e.SMTP_USER ? { auth: { user: e.SMTP_USER, pass: e.SMTP_PASSWORD } } : {}),
  };
}

let transport: Transporter | undefined;
function smtp() {
  transport ??= nodemailer.createTransport(smtpOptions(env()));
  return transport;
}

/** Sends one outbox row; throws on SMTP failure so the queue retries it. Sending twice is prevented by state. */
export async function deliverOutboxMail(outboxId: string): Promise<"sent" | "already-sent" | "missing"> {
  const [row] = await db().select().from(outbox).where(eq(outbox.id, outboxId));
  if (!row) return "missing";
  if (row.state === "sent") return "already-sent";
  try {
    await smtp().sendMail({ from: env().MAIL_FROM, to: row.toAddress, subject: row.subject, text: row.textBody, html: row.htmlBody });
  } catch (e) {
    const message = e instanceof Error ? e.message : String(e);
    await db()
      .update(outbox)
      .set({ attempts: sql`${outbox.attempts} + 1`, lastError: message })
      .where(eq(outbox.id, outboxId));
    throw e;
  }
  await db().update(outbox).set({ state: "sent", sentAt: new Date(), attempts: sql`${outbox.attempts} + 1`, lastError: null }).where(eq(outbox.id, outboxId));
  return "sent";
}

/** Pending mails older than a minute get a fresh job (their job may have run out of retries). */
export async function requeueStaleMail(): Promise<number> {
  const stale = await db()
    .select({ id: outbox.id })
    .from(outbox)
    .where(and(eq(outbox.state, "pending"), lt(outbox.createdAt, new Date(Date.now() - 60_000))));
  const boss = await queue();
  for (const r of stale) await boss.send(QUEUES.mail, { outboxId: r.id }, { singletonKey: `mail-${r.id}`, retryLimit: 12, retryDelay: 5, retryBackoff: true });
  return stale.length;
}

/** Reads mail from the SMTP catcher's REST API (maildev: GET /api/email). */
export interface CaughtMail {
  id: string;
  subject: string;
  text: string;
  html: string;
  to: { address: string }[];
}

export async function mailsTo(address: string): Promise<CaughtMail[]> {
  const base = process.env.MAIL_API_URL;
  if (!base) throw new Error("MAIL_API_URL is not set: run the tests through `npm test`");
  const res = await fetch(`${base}/api/email`);
  const all = (await res.json()) as CaughtMail[];
  return all.filter((m) => m.to.some((t) => t.address.toLowerCase() === address.toLowerCase()));
}

/** Polls the catcher until a mail to `address` matching `subject` arrives (no fixed sleeps). */
export async function waitForMail(address: string, subject: RegExp, timeoutMs = 20_000): Promise<CaughtMail> {
  const until = Date.now() + timeoutMs;
  while (Date.now() < until) {
    const found = (await mailsTo(address)).find((m) => subject.test(m.subject));
    if (found) return found;
    await new Promise((r) => setTimeout(r, 200));
  }
  throw new Error(`no mail to ${address} with subject ${subject} within ${timeoutMs} ms`);
}

export function firstLink(mail: CaughtMail): string {
  const m = /https?:\/\/[^\s<>"]+/.exec(mail.text);
  if (!m) throw new Error(`no link in mail "${mail.subject}"`);
  return m[0];
}

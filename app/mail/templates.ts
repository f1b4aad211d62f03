/** Gatecrash's e-mails: plain text first, with a simple HTML twin. Wording is Gatecrash's own. */
export interface Mail {
  to: string;
  subject: string;
  text: string;
  html: string;
  dedupeKey?: string;
}

const escapeHtml = (s: string) =>
  s.replace(/[&<>"']/g, (c) => ({ "&": "&amp;", "<": "&lt;", ">": "&gt;", '"': "&quot;", "'": "&#39;" })[c] as string);

/** Builds both bodies from paragraphs; a paragraph may carry one link. */
export function composeMail(
  to: string,
  subject: string,
  paragraphs: (string | { text: string; href: string })[],
  dedupeKey?: string,
): Mail {
  const text =
    paragraphs.map((p) => (typeof p === "string" ? p : `${p.text}:\n${p.href}`)).join("\n\n") + "\n\n— Gatecrash\n";
  const body = paragraphs
    .map((p) =>
      typeof p === "string"
        ? `<p>${escapeHtml(p).replace(/\n/g, "<br>")}</p>`
        : `<p><a href="${escapeHtml(p.href)}" style="color:#b23a0b;font-weight:600">${escapeHtml(p.text)}</a></p>`,
    )
    .join("\n");
  const html = `<!doctype html><html><body style="font-family:Inter,system-ui,sans-serif;color:#16131f;max-width:560px">
<div style="font-weight:800;letter-spacing:.04em;color:#b23a0b">GATECRASH</div>
${body}
<p style="color:#6b6580;font-size:12px">You get this because of your account on Gatecrash.</p></body></html>`;
  return { to, subject, text, html, dedupeKey };
}

export function verifyEmailMail(a: { to: string; name: string; url: string }): Mail {
  return composeMail(a.to, "Confirm your e-mail address for Gatecrash", [
    `Hello ${a.name},`,
    "Someone (we hope you) made a Gatecrash account with this address. Confirm it to sign in:",
    { text: "Confirm my address", href: a.url },
    "If it was not you, ignore this mail and no account will be usable.",
  ]);
}

export function resetPasswordMail(a: { to: string; name: string; url: string }): Mail {
  return composeMail(a.to, "Choose a new Gatecrash password", [
    `Hello ${a.name},`,
    "A new password was asked for on your account. The link works for one hour:",
    { text: "Choose a new password", href: a.url },
    "If you did not ask, you can ignore this mail; your password stays as it is.",
  ]);
}

/** One file on an upload receipt, as the entries feature labels it. */
export interface ReceiptFile {
  label: string;
  filename: string;
  sizeBytes: number | null;
  sizeText: string;
  sha256: string | null;
}

/** What an upload receipt says: the upload, where it belongs, and the proof of what was sent. */
export interface UploadReceipt {
  to: string;
  dedupeKey: string;
  number: number;
  late: boolean;
  lateException: boolean;
  lateReason: string | null;
  entry: { id: string; title: string };
  crewName: string;
  competitionTitle: string;
  event: { title: string; timeZone: string };
  at: Date;
  appUrl: string;
  repository: { url: string; commit: string } | null;
  licence: string | null;
  files: ReceiptFile[];
}

/** The receipt a crew member gets for a recorded upload: every file's name, size and SHA-256, and the server time. */
export function uploadReceiptMail(r: UploadReceipt): Mail {
  const local = new Intl.DateTimeFormat("en-GB", { dateStyle: "full", timeStyle: "long", timeZone: r.event.timeZone }).format(r.at);
  const lines: string[] = [];
  if (r.repository) lines.push(`Sources from a repository (fetched by the check run at exactly this commit)\n  ${r.repository.url}\n  commit ${r.repository.commit}`);
  if (r.licence) lines.push(`Licence\n  ${r.licence}`);
  for (const f of r.files) lines.push(`${f.label}\n  ${f.filename}\n  ${f.sizeBytes} bytes (${f.sizeText})\n  SHA-256 ${f.sha256}`);
  return composeMail(
    r.to,
    r.late ? `Late upload #${r.number} for ${r.entry.title} (does not count)` : `Upload receipt: ${r.entry.title}, upload #${r.number}`,
    [
      `Gatecrash recorded upload #${r.number} of "${r.entry.title}" by ${r.crewName} in ${r.competitionTitle} (${r.event.title}).`,
      `Server time: ${r.at.toISOString()} (UTC) — ${local} (${r.event.timeZone}).`,
      r.late
        ? "It arrived after the deadline, so it is kept as late and is not judged. Your last on-time upload stays in the compo."
        : r.lateException
          ? `It arrived after the deadline, within the late exception the organizer granted this entry (${r.lateReason ?? "no reason given"}), so it counts. The jury sees the exception. Its check run is queued.`
          : "It is the upload that counts now. Its check run is queued; the entry page shows the result.",
      lines.join("\n\n"),
      { text: "Open the entry", href: `${r.appUrl}/entries/${r.entry.id}` },
      r.repository
        ? "Keep this mail: the commit hash and the SHA-256 sums prove what you submitted and when."
        : "Keep this mail: the SHA-256 sums prove which files you submitted and when.",
    ],
    r.dedupeKey,
  );
}

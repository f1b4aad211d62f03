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

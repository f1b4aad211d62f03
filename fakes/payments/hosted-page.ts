// HTML for the fake's hosted payment page. Plain, script-free forms, and it says on
// every screen that this is a local test and that no money moves.
import type { StoredCheckoutSession } from "./types";

function escapeHtml(text: string): string {
  return text.replace(/[&<>"']/g, (character) => `&#${character.charCodeAt(0)};`);
}

/** Formats minor units (cents, or whole yen for zero-decimal currencies) for people. */
export function formatAmount(minorUnits: number, currency: string): string {
  const format = new Intl.NumberFormat("en", { style: "currency", currency: currency.toUpperCase() });
  const digits = format.resolvedOptions().maximumFractionDigits ?? 2;
  return format.format(minorUnits / 10 ** digits);
}

const STYLE = `
  body { font: 16px/1.5 system-ui, sans-serif; margin: 0; background: #f3f1ea; color: #1d1b16; }
  main { max-width: 34rem; margin: 2rem auto; background: #fff; border: 2px solid #1d1b16; padding: 1.5rem; }
  .notice { background: #ffe27a; border: 2px dashed #1d1b16; padding: .75rem 1rem; margin-bottom: 1.25rem; }
  .notice strong { display: block; font-size: 1.1rem; }
  table { width: 100%; border-collapse: collapse; margin: 1rem 0; }
  th, td { text-align: left; padding: .35rem 0; border-bottom: 1px solid #d6d1c4; }
  td.amount, th.amount { text-align: right; }
  .total td { font-weight: 700; border-bottom: none; }
  .actions { display: flex; gap: .75rem; margin-top: 1.25rem; }
  button { font: inherit; font-weight: 600; padding: .6rem 1.4rem; border: 2px solid #1d1b16; cursor: pointer; }
  button.pay { background: #1d5e3a; color: #fff; }
  button.cancel { background: #fff; color: #1d1b16; }
  .small { font-size: .875rem; color: #4a463d; }
`;

function layout(title: string, body: string): string {
  return `<!doctype html>
<html lang="en">
<head>
<meta charset="utf-8">
<meta name="viewport" content="width=device-width, initial-scale=1">
<title>${escapeHtml(title)} · Gatecrash local test payment</title>
<style>${STYLE}</style>
</head>
<body>
<main>
<div class="notice" role="note">
  <strong>Local test payment page</strong>
  No money moves. This page is served by Gatecrash's payments fake on this machine;
  no card, bank or payment service is involved.
</div>
${body}
</main>
</body>
</html>
`;
}

export function paymentPage(session: StoredCheckoutSession): string {
  const rows = session.line_items_internal
    .map(
      (item) => `<tr><td>${escapeHtml(item.name)}</td><td>${item.quantity} × ${escapeHtml(formatAmount(item.unit_amount, item.currency))}</td>` +
        `<td class="amount">${escapeHtml(formatAmount(item.unit_amount * item.quantity, item.currency))}</td></tr>`,
    )
    .join("\n");
  const total = formatAmount(session.amount_total, session.currency);
  const email = session.customer_email ? `<p class="small">Receipt to: ${escapeHtml(session.customer_email)}</p>` : "";
  const action = (verb: string): string => `/pay/${encodeURIComponent(session.id)}/${verb}`;
  return layout(
    `Pay ${total}`,
    `<h1>Entry fee: ${escapeHtml(total)}</h1>
<table>
<thead><tr><th scope="col">Item</th><th scope="col">Quantity</th><th scope="col" class="amount">Amount</th></tr></thead>
<tbody>
${rows}
<tr class="total"><td colspan="2">Total</td><td class="amount">${escapeHtml(total)}</td></tr>
</tbody>
</table>
${email}
<div class="actions">
  <form method="post" action="${action("pay")}"><button class="pay" type="submit">Pay</button></form>
  <form method="post" action="${action("cancel")}"><button class="cancel" type="submit">Cancel</button></form>
</div>
<p class="small">Pay marks this test payment as paid and sends signed webhooks to the app.
Cancel goes back without paying.</p>
<p class="small">Reference: ${escapeHtml(session.id)}</p>`,
  );
}

export function messagePage(title: string, message: string, link?: { href: string; label: string }): string {
  const anchor = link ? `<p><a href="${escapeHtml(link.href)}">${escapeHtml(link.label)}</a></p>` : "";
  return layout(title, `<h1>${escapeHtml(title)}</h1>\n<p>${escapeHtml(message)}</p>\n${anchor}`);
}

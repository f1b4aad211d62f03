import QRCode from "qrcode";
import { toCsv } from "~/security/csv";
import type { CodeLine } from "./code-book.server";

const esc = (s: string) => s.replace(/[&<>"']/g, (ch) => ({ "&": "&amp;", "<": "&lt;", ">": "&gt;", '"': "&quot;", "'": "&#39;" })[ch] as string);

/**
 * The printable sheet of vote codes, one slip each, cut along the dashed lines; every slip names the compos
 * its code votes in. A whole HTML document of its own, styled inline (the content security policy allows
 * style attributes but no <style> elements).
 */
export async function codeSheetHtml(opts: { heading: string; url: string; lines: CodeLine[] }): Promise<string> {
  const qr = await QRCode.toString(opts.url, { type: "svg", margin: 0, errorCorrectionLevel: "M" });
  const slip = "display:flex;gap:4mm;align-items:center;border:1px dashed #6b6580;padding:4mm;break-inside:avoid";
  const slips = opts.lines
    .map((x) => {
      const compos = x.compos.map((c) => c.title);
      return `<li class="slip" style="${slip}"><div aria-hidden="true" style="width:22mm;height:22mm;flex:none">${qr.replace("<svg ", '<svg width="100%" height="100%" ')}</div><div>
<p style="font-size:8pt;text-transform:uppercase;letter-spacing:.12em;color:#d9480f;margin:0;font-weight:700">Audience vote${x.partyWide ? " · whole party" : ""}</p>
<p style="font:700 20pt ui-monospace,'DejaVu Sans Mono',monospace;letter-spacing:.08em;margin:1mm 0">${esc(x.code)}</p>
<p style="font-size:8pt;margin:0" data-compos>Votes in: ${esc(compos.join(" · "))}</p>
<p style="font-size:8pt;margin:0;word-break:break-all">${esc(opts.url)}</p>
<p style="font-size:7pt;color:#4a4458;margin:1mm 0 0">One ballot in each compo named here. Changeable until that vote closes, from the same browser.</p></div></li>`;
    })
    .join("\n");
  return `<!doctype html><html lang="en"><head><meta charset="utf-8"><title>Vote codes · ${esc(opts.heading)}</title></head>
<body style="font-family:Inter,system-ui,sans-serif;color:#16131f;margin:12mm">
<h1 style="font-size:16pt;margin:0 0 4mm">Vote codes: ${esc(opts.heading)}</h1>
<p style="font-size:9pt;color:#4a4458;margin:0 0 6mm">${opts.lines.length} unused codes. Print this page (Ctrl+P) and cut along the dashed lines. Codes used anywhere are left out.</p>
<ul style="list-style:none;padding:0;margin:0;display:grid;grid-template-columns:1fr 1fr">${slips}</ul>
</body></html>`;
}

/** Every code as CSV: one line per code, the compos it votes in, and when it was used in each. */
export function codeSheetCsv(lines: CodeLine[]): string {
  return toCsv(
    ["code", "party_wide", "votes_in", "created_at", "used_in"],
    lines.map((l) => [
      l.code,
      l.partyWide,
      l.compos.map((c) => c.slug).join(" "),
      l.createdAt,
      l.compos
        .filter((c) => c.redeemedAt)
        .map((c) => `${c.slug}@${c.redeemedAt}`)
        .join(" "),
    ]),
  );
}

export function htmlResponse(html: string): Response {
  return new Response(html, { headers: { "Content-Type": "text/html; charset=utf-8", "Cache-Control": "no-store" } });
}

export function csvResponse(body: string, filename: string): Response {
  return new Response(body, { headers: { "Content-Type": "text/csv; charset=utf-8", "Content-Disposition": `attachment; filename="${filename}"`, "Cache-Control": "no-store" } });
}

import QRCode from "qrcode";
import { requireCompetitionOrganizer } from "~/showcase/organizer.server";
import { voteUrl } from "~/stage/stage.server";
import { voteCodesOf } from "~/voting/voting.server";
import type { Route } from "./+types/organize.audience.codes";

const esc = (s: string) => s.replace(/[&<>"']/g, (ch) => ({ "&": "&amp;", "<": "&lt;", ">": "&gt;", '"': "&quot;", "'": "&#39;" })[ch] as string);

/** A print view of the unused vote codes: one slip each, cut along the dashed lines. A whole HTML document of its own. */
export async function loader({ request, params, context }: Route.LoaderArgs) {
  const { competition: c } = await requireCompetitionOrganizer(request, context, params.competitionId);
  const codes = (await voteCodesOf(c.id)).filter((x) => !x.redeemedAt);
  const url = voteUrl(c);
  const qr = await QRCode.toString(url, { type: "svg", margin: 0, errorCorrectionLevel: "M" });
  // The content security policy allows style attributes but no <style> elements, so the sheet is styled inline.
  const slip = "display:flex;gap:4mm;align-items:center;border:1px dashed #6b6580;padding:4mm;break-inside:avoid";
  const slips = codes
    .map(
      (x) => `<li class="slip" style="${slip}"><div aria-hidden="true" style="width:22mm;height:22mm;flex:none">${qr.replace("<svg ", '<svg width="100%" height="100%" ')}</div><div>
<p style="font-size:8pt;text-transform:uppercase;letter-spacing:.12em;color:#d9480f;margin:0;font-weight:700">Audience vote · ${esc(c.title)}</p>
<p style="font:700 20pt ui-monospace,'DejaVu Sans Mono',monospace;letter-spacing:.08em;margin:1mm 0">${esc(x.code)}</p>
<p style="font-size:8pt;margin:0;word-break:break-all">${esc(url)}</p>
<p style="font-size:7pt;color:#4a4458;margin:1mm 0 0">One ballot. Changeable until the vote closes, from the same browser.</p></div></li>`,
    )
    .join("\n");
  const html = `<!doctype html><html lang="en"><head><meta charset="utf-8"><title>Vote codes · ${esc(c.title)}</title></head>
<body style="font-family:Inter,system-ui,sans-serif;color:#16131f;margin:12mm">
<h1 style="font-size:16pt;margin:0 0 4mm">Vote codes: ${esc(c.title)} — ${esc(c.eventTitle)}</h1>
<p style="font-size:9pt;color:#4a4458;margin:0 0 6mm">${codes.length} unused codes. Print this page (Ctrl+P) and cut along the dashed lines. Used codes are left out.</p>
<ul style="list-style:none;padding:0;margin:0;display:grid;grid-template-columns:1fr 1fr">${slips}</ul>
</body></html>`;
  return new Response(html, { headers: { "Content-Type": "text/html; charset=utf-8", "Cache-Control": "no-store" } });
}

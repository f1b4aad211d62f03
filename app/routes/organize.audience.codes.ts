import QRCode from "qrcode";
import { requireCompetitionOrganizer } from "~/showcase/organizer.server";
import { voteUrl } from "~/stage/stage.server";
import { voteCodesOf } from "~/voting/voting.server";
import type { Route } from "./+types/organize.audience.codes";

const esc = (s: string) => s.replace(/[&<>"']/g, (ch) => ({ "&": "&amp;", "<": "&lt;", ">": "&gt;", '"': "&quot;", "'": "&#39;" })[ch] as string);

/** A print view of the unused vote codes: one slip each, cut along the dashed lines. A whole HTML document of its own. */
export async function loader({ request, params }: Route.LoaderArgs) {
  const { competition: c } = await requireCompetitionOrganizer(request, params.competitionId);
  const codes = (await voteCodesOf(c.id)).filter((x) => !x.redeemedAt);
  const url = voteUrl(c);
  const qr = await QRCode.toString(url, { type: "svg", margin: 0, errorCorrectionLevel: "M" });
  const slips = codes
    .map(
      (x) => `<li class="slip"><div class="qr" aria-hidden="true">${qr}</div><div><p class="k">Audience vote · ${esc(c.title)}</p>
<p class="code">${esc(x.code)}</p><p class="u">${esc(url)}</p><p class="h">One ballot. Changeable until the vote closes, from the same browser.</p></div></li>`,
    )
    .join("\n");
  const html = `<!doctype html><html lang="en"><head><meta charset="utf-8"><title>Vote codes · ${esc(c.title)}</title>
<style>
body{font-family:Inter,system-ui,sans-serif;color:#16131f;margin:12mm}
h1{font-size:16pt;margin:0 0 4mm} .note{font-size:9pt;color:#4a4458;margin:0 0 6mm}
ul{list-style:none;padding:0;margin:0;display:grid;grid-template-columns:1fr 1fr;gap:0}
.slip{display:flex;gap:4mm;align-items:center;border:1px dashed #6b6580;padding:4mm;break-inside:avoid}
.qr svg{width:22mm;height:22mm;display:block} .k{font-size:8pt;text-transform:uppercase;letter-spacing:.12em;color:#d9480f;margin:0;font-weight:700}
.code{font:700 20pt ui-monospace,"DejaVu Sans Mono",monospace;letter-spacing:.08em;margin:1mm 0} .u{font-size:8pt;margin:0;word-break:break-all} .h{font-size:7pt;color:#4a4458;margin:1mm 0 0}
@media print{.noprint{display:none}}
</style></head><body>
<h1>Vote codes: ${esc(c.title)} — ${esc(c.eventTitle)}</h1>
<p class="note noprint">${codes.length} unused codes. Print this page (Ctrl+P) and cut along the dashed lines. Used codes are left out.</p>
<ul>${slips}</ul>
</body></html>`;
  return new Response(html, { headers: { "Content-Type": "text/html; charset=utf-8", "Cache-Control": "no-store" } });
}

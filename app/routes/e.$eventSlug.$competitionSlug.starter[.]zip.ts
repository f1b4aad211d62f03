import { data } from "react-router";
import { rulesetJson } from "~/competitions/ruleset-io";
import { publicCompetition } from "~/competitions/public.server";
import { StarterError, starterFiles } from "~/sources/starter";
import { starterZip } from "~/sources/starter-zip.server";
import type { Route } from "./+types/e.$eventSlug.$competitionSlug.starter[.]zip";

/** The compo's starter bundle: a minimal design that passes its ruleset, a testbench and the local check. */
export async function loader({ params, context }: Route.LoaderArgs) {
  const found = await publicCompetition(context, params.eventSlug, params.competitionSlug);
  if (!found) throw data({ message: "No such compo." }, { status: 404 });
  const { competition: c, event: e, ruleset } = found;
  let files;
  try {
    files = starterFiles(ruleset, { compo: `${c.title} (${e.title})`, rulesetJson: rulesetJson(ruleset), rulesVersion: c.rulesetVersion });
  } catch (err) {
    if (err instanceof StarterError) throw data({ message: `No starter bundle for this compo: ${err.message}.` }, { status: 409 });
    throw err;
  }
  const folder = `${e.slug}-${c.slug}-starter`;
  return new Response(new Uint8Array(await starterZip(folder, files)), {
    headers: { "Content-Type": "application/zip", "Content-Disposition": `attachment; filename="${folder}.zip"`, "Cache-Control": "no-store" },
  });
}

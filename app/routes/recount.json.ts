import { data } from "react-router";
import { requirePublished } from "~/results/page.server";
import type { Route } from "./+types/recount.json";

/**
 * The anonymised scores (?side=jury) or ballots (?side=audience, the default) of a published version, in the
 * recount file format: `npm run recount -- FILE` recounts them. Judges and voters are stable pseudonyms.
 */
export async function loader({ request, params }: Route.LoaderArgs) {
  const { competition: c, published: p } = await requirePublished(request, params);
  const side = new URL(request.url).searchParams.get("side") ?? "audience";
  if (side !== "jury" && side !== "audience") throw data({ message: 'side is "jury" or "audience".' }, { status: 400 });
  const file = p.payload.recount[side];
  if (!file) throw data({ message: "This competition has no jury criteria, so there are no scores to recount." }, { status: 404 });
  return new Response(`${JSON.stringify(file, null, 2)}\n`, {
    headers: {
      "Content-Type": "application/json; charset=utf-8",
      "Content-Disposition": `attachment; filename="recount-${c.slug}-v${p.version}-${side}.json"`,
      "X-Results-SHA256": p.sha256,
    },
  });
}

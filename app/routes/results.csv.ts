import { resultsCsv } from "~/results/format";
import { requirePublished } from "~/results/page.server";
import type { Route } from "./+types/results.csv";

export async function loader({ request, params }: Route.LoaderArgs) {
  const { competition: c, published: p } = await requirePublished(request, params);
  return new Response(resultsCsv(p.payload), {
    headers: {
      "Content-Type": "text/csv; charset=utf-8",
      "Content-Disposition": `attachment; filename="results-${c.slug}-v${p.version}.csv"`,
      "X-Results-SHA256": p.sha256,
    },
  });
}

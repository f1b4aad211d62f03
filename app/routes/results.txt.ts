import { resultsText } from "~/results/format";
import { requirePublished } from "~/results/page.server";
import type { Route } from "./+types/results.txt";

export async function loader({ request, params }: Route.LoaderArgs) {
  const { published: p } = await requirePublished(request, params);
  return new Response(resultsText(p.payload, { sha256: p.sha256, scheme: p.hashScheme }, p.publishedAt), { headers: { "Content-Type": "text/plain; charset=utf-8", "X-Results-SHA256": p.sha256 } });
}

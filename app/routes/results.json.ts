import { requirePublished } from "~/results/page.server";
import type { Route } from "./+types/results.json";

/**
 * A published version's payload as JSON, with its hash and the hash's scheme in the headers. For versions under
 * `rfc8785-sha256` any RFC 8785 (JCS) tool reproduces the hash: `canonicalize < results.json | sha256sum`.
 */
export async function loader({ request, params }: Route.LoaderArgs) {
  const { competition: c, published: p } = await requirePublished(request, params);
  return new Response(`${JSON.stringify(p.payload, null, 2)}\n`, {
    headers: {
      "Content-Type": "application/json; charset=utf-8",
      "Content-Disposition": `attachment; filename="results-${c.slug}-v${p.version}.json"`,
      "X-Results-SHA256": p.sha256,
      "X-Results-Hash-Scheme": p.hashScheme,
    },
  });
}

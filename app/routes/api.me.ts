import { apiJson, requireApiUser } from "~/api/json.server";
import { roleSummary } from "~/users/summary.server";
import type { Route } from "./+types/api.me";

/** Who am I: the smallest example of the JSON API convention. */
export async function loader({ request, context }: Route.LoaderArgs) {
  const user = await requireApiUser(context);
  const roles = await roleSummary(user);
  return apiJson({ id: user.id, name: user.name, email: user.email, emailVerified: user.emailVerified, roles });
}

import { auth } from "~/auth/auth.server";
import type { Route } from "./+types/api.auth";

// better-auth's own endpoints (verification links, session, sign-in API).
export async function loader({ request }: Route.LoaderArgs) {
  return auth().handler(request);
}

export async function action({ request }: Route.ActionArgs) {
  return auth().handler(request);
}

import { redirect } from "react-router";
import { callAuth, cookieHeaders } from "~/auth/forward.server";
import type { Route } from "./+types/sign-out";

export async function loader() {
  return redirect("/");
}

export async function action({ request, context }: Route.ActionArgs) {
  const res = await callAuth(request, context, "/sign-out", {});
  return redirect("/", { headers: cookieHeaders(res) });
}

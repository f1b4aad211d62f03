import { data } from "react-router";
import type { Route } from "./+types/not-found";

export const meta: Route.MetaFunction = () => [{ title: "Not found · Gatecrash" }];

export async function loader() {
  throw data({ message: "This page does not exist, or it is not public." }, { status: 404 });
}

export default function NotFound() {
  return null;
}

export { RouteErrorBoundary as ErrorBoundary } from "~/components/RouteErrorBoundary";

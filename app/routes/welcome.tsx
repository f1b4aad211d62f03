import { Link } from "react-router";
import { requireUser } from "~/auth/guards.server";
import type { Route } from "./+types/welcome";

export const meta: Route.MetaFunction = () => [{ title: "Welcome · Gatecrash" }];

export async function loader({ request, context }: Route.LoaderArgs) {
  const user = await requireUser(request, context);
  return { name: user.name, verified: user.emailVerified };
}

export default function Welcome({ loaderData }: Route.ComponentProps) {
  return (
    <div className="mx-auto max-w-md card">
      <p className="kicker">Address confirmed</p>
      <h1 className="mt-1 text-2xl font-extrabold" data-testid="welcome">
        Welcome, {loaderData.name}
      </h1>
      <p className="mt-3 text-ink-soft">Your account is ready. Find a compo to enter, or watch the showcase and vote.</p>
      <Link to="/" className="btn-primary mt-6">
        Go to my start page
      </Link>
    </div>
  );
}

export { RouteErrorBoundary as ErrorBoundary } from "~/components/RouteErrorBoundary";

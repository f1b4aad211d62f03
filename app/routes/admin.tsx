import { requireAdmin } from "~/auth/guards.server";
import { pageCall } from "~/errors/http.server";
import { platformCounts } from "~/users/admin.server";
import type { Route } from "./+types/admin";

export const meta: Route.MetaFunction = () => [{ title: "Admin · Gatecrash" }];

export async function loader({ request, context }: Route.LoaderArgs) {
  const admin = await requireAdmin(request, context);
  return pageCall(() => platformCounts(admin));
}

export default function Admin({ loaderData: d }: Route.ComponentProps) {
  return (
    <div data-testid="admin-home">
      <p className="kicker">Platform</p>
      <h1 className="mb-6 mt-1 text-display font-extrabold">Admin</h1>
      <dl className="grid grid-cols-2 gap-3 sm:grid-cols-4">
        {(
          [
            ["Accounts", d.users],
            ["Events", d.events],
            ["Compos", d.competitions],
            ["Entries", d.entries],
          ] as const
        ).map(([k, v]) => (
          <div key={k} className="card">
            <dt className="text-sm text-mute">{k}</dt>
            <dd className="text-3xl font-extrabold">{v}</dd>
          </div>
        ))}
      </dl>
    </div>
  );
}

export { RouteErrorBoundary as ErrorBoundary } from "~/components/RouteErrorBoundary";

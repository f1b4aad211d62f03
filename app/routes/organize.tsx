import { forbidden, requireUser } from "~/auth/guards.server";
import { competitionsOfEvents } from "~/competitions/listing.server";
import { CompetitionList } from "~/components/CompetitionList";
import { roleSummary } from "~/users/summary.server";
import type { Route } from "./+types/organize";

export const meta: Route.MetaFunction = () => [{ title: "Organize · Gatecrash" }];

export async function loader({ request }: Route.LoaderArgs) {
  const user = await requireUser(request);
  const roles = await roleSummary(user);
  if (roles.organizerOf.length === 0 && !roles.isAdmin) forbidden("Only organizers of an event can open this page.");
  return { events: roles.organizerOf, competitions: await competitionsOfEvents(roles.organizerOf.map((e) => e.id)) };
}

export default function Organize({ loaderData }: Route.ComponentProps) {
  return (
    <div data-testid="organize-home">
      <p className="kicker">Organizer</p>
      <h1 className="mb-6 mt-1 text-display font-extrabold">Your compos</h1>
      <CompetitionList items={loaderData.competitions} linkTo={(c) => `/organize/${c.id}`} />
    </div>
  );
}

export { RouteErrorBoundary as ErrorBoundary } from "~/components/RouteErrorBoundary";

import { Link } from "react-router";
import { forbidden, requireUser } from "~/auth/guards.server";
import { closeDueAmong } from "~/competitions/service.server";
import { competitionsOfEvents } from "~/competitions/listing.server";
import { CompetitionList } from "~/components/CompetitionList";
import { roleSummary } from "~/users/summary.server";
import type { Route } from "./+types/organize";

export const meta: Route.MetaFunction = () => [{ title: "Organize · Gatecrash" }];

export async function loader({ request, context }: Route.LoaderArgs) {
  const user = await requireUser(request, context);
  const roles = await roleSummary(user);
  if (roles.organizerOf.length === 0 && !roles.isAdmin) forbidden("Only organizers of an event can open this page. Announce an event to become its organizer.");
  const ids = roles.organizerOf.map((e) => e.id);
  await closeDueAmong((await competitionsOfEvents(ids)).map((c) => c.id));
  return { events: roles.organizerOf, competitions: await competitionsOfEvents(ids) };
}

export default function Organize({ loaderData }: Route.ComponentProps) {
  return (
    <div data-testid="organize-home">
      <p className="kicker">Organizer</p>
      <div className="mb-6 mt-1 flex flex-wrap items-center justify-between gap-3">
        <h1 className="text-display font-extrabold">Your compos</h1>
        <Link to="/organize/events/new" className="btn-signal">
          Announce an event
        </Link>
      </div>
      <CompetitionList items={loaderData.competitions} linkTo={(c) => `/organize/${c.id}`} />
      <h2 className="mb-3 mt-10 text-xl font-bold">Your events</h2>
      {loaderData.events.length === 0 ? (
        <p className="text-mute">None yet.</p>
      ) : (
        <ul className="flex flex-wrap gap-2">
          {loaderData.events.map((e) => (
            <li key={e.id}>
              <Link to={`/organize/events/${e.id}`} className="btn-quiet">
                {e.title}
              </Link>
            </li>
          ))}
        </ul>
      )}
    </div>
  );
}

export { RouteErrorBoundary as ErrorBoundary } from "~/components/RouteErrorBoundary";

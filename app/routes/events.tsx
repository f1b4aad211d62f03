import { publicCompetitions } from "~/competitions/listing.server";
import { CompetitionList } from "~/components/CompetitionList";
import type { Route } from "./+types/events";

export const meta: Route.MetaFunction = () => [
  { title: "Compos · Gatecrash" },
  { name: "description", content: "Tiny-silicon demo compos on Gatecrash: rules, entries, showcase and results." },
];

export async function loader(_: Route.LoaderArgs) {
  return { competitions: await publicCompetitions() };
}

export default function Events({ loaderData }: Route.ComponentProps) {
  return (
    <div>
      <p className="kicker">Showcase</p>
      <h1 className="mb-6 mt-1 text-display font-extrabold">Compos</h1>
      <CompetitionList items={loaderData.competitions} linkTo={(c) => `/e/${c.eventSlug}/${c.slug}`} />
    </div>
  );
}

export { RouteErrorBoundary as ErrorBoundary } from "~/components/RouteErrorBoundary";

import { forbidden, requireUser } from "~/auth/guards.server";
import { competitionsOfEvents } from "~/competitions/listing.server";
import { CompetitionList } from "~/components/CompetitionList";
import { roleSummary } from "~/users/summary.server";
import type { Route } from "./+types/judging";

export const meta: Route.MetaFunction = () => [{ title: "Judging · Gatecrash" }];

export async function loader({ request, context }: Route.LoaderArgs) {
  const user = await requireUser(request, context);
  const roles = await roleSummary(user);
  if (roles.judgeOf.length === 0) forbidden("Only judges of an event can open this page.");
  return { competitions: await competitionsOfEvents(roles.judgeOf.map((e) => e.id)) };
}

export default function Judging({ loaderData }: Route.ComponentProps) {
  return (
    <div data-testid="judging-home">
      <p className="kicker text-violet">Jury</p>
      <h1 className="mb-6 mt-1 text-display font-extrabold">Compos to judge</h1>
      <CompetitionList items={loaderData.competitions} linkTo={(c) => `/judging/${c.id}`} />
    </div>
  );
}

export { RouteErrorBoundary as ErrorBoundary } from "~/components/RouteErrorBoundary";

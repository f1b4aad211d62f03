import { StageDeck } from "~/components/StageDeck";
import { requireCompetitionOrganizer } from "~/showcase/organizer.server";
import { stageScreens } from "~/stage/stage.server";
import type { Route } from "./+types/stage";

export async function loader({ request, params, context }: Route.LoaderArgs) {
  const { competition: c } = await requireCompetitionOrganizer(request, context, params.competitionId);
  return { title: c.title, competitionId: c.id, screens: await stageScreens(c) };
}

export const meta: Route.MetaFunction = ({ data }) => [{ title: data ? `Stage · ${data.title} · Gatecrash` : "Stage · Gatecrash" }];

export default function Stage({ loaderData }: Route.ComponentProps) {
  return <StageDeck screens={loaderData.screens} exitHref={`/organize/${loaderData.competitionId}/audience`} />;
}

export { RouteErrorBoundary as ErrorBoundary } from "~/components/RouteErrorBoundary";

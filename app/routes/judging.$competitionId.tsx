import { data, Link } from "react-router";
import { requireUser } from "~/auth/guards.server";
import { ScoringGrid } from "~/components/ScoringGrid";
import { StateBadge } from "~/components/StateBadge";
import { competitionForJudge } from "~/judging/access.server";
import { gridFor } from "~/judging/grid.server";
import type { Route } from "./+types/judging.$competitionId";

export const meta: Route.MetaFunction = ({ data }) => [{ title: `${data?.competition.title ?? "Scoring"} · Judging · Gatecrash` }];

export async function loader({ request, params, context }: Route.LoaderArgs) {
  const user = await requireUser(request, context);
  const c = await competitionForJudge(user.id, params.competitionId);
  if (!c) throw data({ message: "This compo is not among the ones you judge." }, { status: 404 });
  const grid = await gridFor(user.id, c);
  return {
    competition: { id: c.id, title: c.title, state: c.state, eventTitle: c.eventTitle, blindJudging: c.blindJudging, orderMode: c.orderMode, locked: c.judgingLocked },
    grid,
  };
}

export default function JudgingGrid({ loaderData }: Route.ComponentProps) {
  const { competition: c, grid } = loaderData;
  return (
    <div data-testid="scoring-grid-page">
      <p className="kicker text-violet">
        <Link to="/judging" className="hover:underline">
          Jury
        </Link>{" "}
        · {c.eventTitle}
      </p>
      <div className="mb-2 mt-1 flex flex-wrap items-center gap-3">
        <h1 className="text-display font-extrabold">{c.title}</h1>
        <StateBadge state={c.state} />
      </div>
      <p className="mb-6 max-w-3xl text-sm text-ink-soft">
        Rows are the compo's active entries with a complete upload, in {c.orderMode === "per-judge" ? "your own random order" : "the jury's shared random order"} (it
        never changes under you). {c.blindJudging ? "Judging is blind: crews stay hidden until the results are out." : "Crews are shown."}
        {grid.conflicted > 0 && ` ${grid.conflicted} entr${grid.conflicted === 1 ? "y is" : "ies are"} left out because you have a conflict with ${grid.conflicted === 1 ? "it" : "them"}.`}
        {grid.withoutUpload > 0 && ` ${grid.withoutUpload} active entr${grid.withoutUpload === 1 ? "y has" : "ies have"} no complete upload and ${grid.withoutUpload === 1 ? "is" : "are"} not judged.`}
      </p>
      {grid.criteria.length === 0 ? (
        <p className="card">The organizers have not set this compo's criteria yet.</p>
      ) : (
        <ScoringGrid competitionId={c.id} data={grid} locked={c.locked} />
      )}
    </div>
  );
}

export { RouteErrorBoundary as ErrorBoundary } from "~/components/RouteErrorBoundary";

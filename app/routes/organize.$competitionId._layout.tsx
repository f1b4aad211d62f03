import { NavLink, Outlet } from "react-router";
import { requireCompetitionRole } from "~/competitions/access.server";
import type { Route } from "./+types/organize.$competitionId._layout";

/**
 * The layout of the organizer's compo pages (dashboard, edit, entries, jury, standings, audience vote, results, stage running order):
 * one sub-navigation above each of them. Its loader has the same guard as every page under it (404 for anyone
 * who does not organize the compo's event); the pages keep their own guards, since loaders run in parallel.
 */
export async function loader({ request, params, context }: Route.LoaderArgs) {
  const { competition } = await requireCompetitionRole(request, context, params.competitionId, "organizer");
  return { competition: { id: competition.id, title: competition.title } };
}

const PAGES: { to: string; label: string; end?: boolean }[] = [
  { to: "", label: "Dashboard", end: true },
  { to: "edit", label: "Edit" },
  { to: "entries", label: "Entries" },
  { to: "jury", label: "Jury" },
  { to: "standings", label: "Standings" },
  { to: "audience", label: "Audience vote" },
  { to: "results", label: "Results" },
  { to: "stage", label: "Stage running order" },
];

export default function CompoPages({ loaderData }: Route.ComponentProps) {
  const base = `/organize/${loaderData.competition.id}`;
  const linkClass = ({ isActive }: { isActive: boolean }) =>
    `rounded-md px-3 py-1.5 text-sm font-semibold ${isActive ? "bg-ink text-card" : "text-ink-soft hover:bg-line/60 hover:text-ink"}`;
  return (
    <div>
      <nav aria-label="Compo pages" className="mb-6 border-b border-line pb-3">
        <ul className="flex flex-wrap gap-1">
          {PAGES.map((p) => (
            <li key={p.label}>
              <NavLink to={p.to ? `${base}/${p.to}` : base} end={p.end} className={linkClass}>
                {p.label}
              </NavLink>
            </li>
          ))}
        </ul>
      </nav>
      <Outlet />
    </div>
  );
}

export { RouteErrorBoundary as ErrorBoundary } from "~/components/RouteErrorBoundary";

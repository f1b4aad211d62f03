import { data, Link } from "react-router";
import { requireJuryOrganizer } from "~/judging/http.server";
import { historyFor } from "~/judging/standings.server";
import type { Route } from "./+types/organize.$competitionId.entries.$entryId.history";

export const meta: Route.MetaFunction = ({ data }) => [{ title: `Score history · ${data?.entry.title ?? "Entry"} · Gatecrash` }];

export async function loader({ request, params, context }: Route.LoaderArgs) {
  const { c } = await requireJuryOrganizer(request, context, params.competitionId);
  const h = await historyFor(c, params.entryId);
  if (!h) throw data({ message: "This entry is not in this compo." }, { status: 404 });
  return { competition: { id: c.id, title: c.title, timeZone: c.timeZone }, entry: h.entry, rows: h.rows };
}

export default function ScoreHistory({ loaderData }: Route.ComponentProps) {
  const { competition: c, entry, rows } = loaderData;
  const when = new Intl.DateTimeFormat("en-GB", { dateStyle: "medium", timeStyle: "medium", timeZone: c.timeZone });
  return (
    <div data-testid="score-history">
      <p className="kicker">
        <Link to={`/organize/${c.id}/standings`} className="hover:underline">
          Standings of {c.title}
        </Link>
      </p>
      <h1 className="mb-2 mt-1 text-display font-extrabold">Score history: {entry.title}</h1>
      <p className="mb-6 text-sm text-ink-soft">Every change to every judge's scoresheet on this entry, newest first. Times in the event's time zone ({c.timeZone}).</p>
      {rows.length === 0 ? (
        <p className="card">No scores yet.</p>
      ) : (
        <div className="overflow-x-auto rounded-xl border border-line bg-card">
          <table className="w-full text-sm">
            <thead className="bg-paper text-left text-ink-soft">
              <tr>
                <th className="px-3 py-2">When</th>
                <th className="px-3 py-2">Judge's sheet</th>
                <th className="px-3 py-2">Changed by</th>
                <th className="px-3 py-2">Criterion</th>
                <th className="px-3 py-2">Before</th>
                <th className="px-3 py-2">After</th>
              </tr>
            </thead>
            <tbody>
              {rows.map((r) => (
                <tr key={r.id} className="border-t border-line">
                  <td className="whitespace-nowrap px-3 py-2">{when.format(new Date(r.changedAt))}</td>
                  <td className="px-3 py-2">{r.judge}</td>
                  <td className="px-3 py-2">{r.changedBy}</td>
                  <td className="px-3 py-2">{r.criterion}</td>
                  <td className="px-3 py-2 font-mono">{r.oldValue ?? <span className="text-mute">empty</span>}</td>
                  <td className="px-3 py-2 font-mono">{r.newValue ?? <span className="text-mute">empty</span>}</td>
                </tr>
              ))}
            </tbody>
          </table>
        </div>
      )}
    </div>
  );
}

export { RouteErrorBoundary as ErrorBoundary } from "~/components/RouteErrorBoundary";

import { Link } from "react-router";
import { shuttleCandidates } from "~/archive/shuttle.server";
import { requireEventRole } from "~/competitions/access.server";
import type { Route } from "./+types/organize.party.shuttle";

/** Choose the passing entries that go on the shuttle; the form downloads their layouts and the manifest as one zip. */
export async function loader({ request, params, context }: Route.LoaderArgs) {
  const { event } = await requireEventRole(request, context, params.eventId, "organizer");
  const list = await shuttleCandidates(event.id);
  return {
    event: { id: event.id, title: event.title },
    candidates: list.map((c) => ({ entryId: c.entryId, title: c.title, crew: c.crew, compo: c.compo.title, verdict: c.verdict, shape: c.figures.tileShape, size: c.figures.widthUm && c.figures.heightUm ? `${c.figures.widthUm} × ${c.figures.heightUm} µm` : "—", flipFlops: c.figures.flipFlops })),
  };
}

export const meta: Route.MetaFunction = ({ data }) => [{ title: `Shuttle export · ${data?.event.title ?? "Party"} · Gatecrash` }];

export default function ShuttleExport({ loaderData }: Route.ComponentProps) {
  const { event, candidates } = loaderData;
  return (
    <div className="mx-auto max-w-4xl">
      <p className="kicker">
        <Link to={`/organize/events/${event.id}/party`}>{event.title} · Party desk</Link>
      </p>
      <h1 className="mb-2 mt-1 text-display font-extrabold">Export for the shuttle</h1>
      <p className="text-sm text-ink-soft">
        Entries whose counting upload passed its check (with or without warnings). Tick the ones that go on the chip; the zip holds their layouts, a
        manifest (<code className="font-mono">shuttle-manifest.json</code>, format gatecrash-shuttle/1) and SHA256SUMS.
      </p>
      <p className="mt-2 rounded-md border border-warn bg-warn-soft p-3 text-sm text-warn">
        Not signoff: a passing Gatecrash check does not replace the foundry's or shuttle's own design-rule and layout-versus-schematic checks.
      </p>
      {candidates.length === 0 ? (
        <p className="mt-6 text-mute">No entry has passed its check yet.</p>
      ) : (
        <form method="get" action={`/organize/events/${event.id}/shuttle.zip`} className="card mt-6">
          <table className="w-full text-sm" data-testid="shuttle-candidates">
            <thead>
              <tr className="text-left text-xs uppercase tracking-wider text-mute">
                <th scope="col" className="py-1">On the shuttle</th>
                <th scope="col">Entry</th>
                <th scope="col">Compo</th>
                <th scope="col">Check</th>
                <th scope="col">Tile</th>
                <th scope="col" className="text-right">Flip-flops</th>
              </tr>
            </thead>
            <tbody>
              {candidates.map((c) => (
                <tr key={c.entryId} className="border-t border-line">
                  <td className="py-1.5">
                    <input type="checkbox" name="entry" value={c.entryId} defaultChecked aria-label={`${c.title} on the shuttle`} />
                  </td>
                  <td>
                    {c.title} <span className="text-ink-soft">by {c.crew}</span>
                  </td>
                  <td>{c.compo}</td>
                  <td>{c.verdict}</td>
                  <td>{c.shape ?? "—"} · {c.size}</td>
                  <td className="text-right tabular-nums">{c.flipFlops ?? "—"}</td>
                </tr>
              ))}
            </tbody>
          </table>
          <button type="submit" className="btn-primary mt-4">Download the shuttle zip</button>
        </form>
      )}
    </div>
  );
}

export { RouteErrorBoundary as ErrorBoundary } from "~/components/RouteErrorBoundary";

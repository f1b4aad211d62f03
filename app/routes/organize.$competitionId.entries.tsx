import { parseWithZod } from "@conform-to/zod/v4";
import { data, Link, useActionData, useNavigation } from "react-router";
import { requireCompetitionRole } from "~/competitions/access.server";
import { disqualifyEntry, entriesTable } from "~/competitions/entries-admin.server";
import { disqualifySchema } from "~/competitions/entries-forms";
import { formatInZone } from "~/competitions/timezone";
import { EntriesTable, type EntryRowView } from "~/competitions/ui/EntriesTable";
import { StateBadge } from "~/components/StateBadge";
import { env } from "~/env.server";
import { attempt, formReply } from "~/errors/http.server";
import type { Route } from "./+types/organize.$competitionId.entries";
import { readForm } from "~/api/body.server";

export const meta: Route.MetaFunction = ({ data }) => [{ title: `Entries · ${data?.competition.title ?? "Compo"} · Gatecrash` }];

export async function loader({ request, params, context }: Route.LoaderArgs) {
  const { competition, event } = await requireCompetitionRole(request, context, params.competitionId, "organizer");
  const rows = await entriesTable(competition.id);
  const view: EntryRowView[] = rows.map((r) => ({
    id: r.id,
    title: r.title,
    crewHandle: r.crewHandle,
    crewName: r.crewName,
    feeState: r.feeState,
    state: r.state,
    disqualifiedReason: r.disqualifiedReason,
    uploadNumber: r.upload?.number ?? null,
    uploadAt: r.upload?.at ?? null,
    uploadLate: r.upload?.state === "late",
    uploadAtLabel: r.upload?.at ? formatInZone(r.upload.at, event.timeZone) : "—",
    verdict: r.verdict ?? r.checkState ?? "none",
    files: r.files.filter((f) => f.state === "confirmed").map(({ id, kind, filename, sizeBytes }) => ({ id, kind, filename, sizeBytes })),
  }));
  return { competition: { id: competition.id, title: competition.title, state: competition.state }, event: { title: event.title }, rows: view };
}

export async function action({ request, params, context }: Route.ActionArgs) {
  const { user, competition } = await requireCompetitionRole(request, context, params.competitionId, "organizer");
  const formData = await readForm(request);
  const submission = parseWithZod(formData, { schema: disqualifySchema });
  const entryId = String(formData.get("entryId") ?? "");
  if (submission.status !== "success") return { entryId, result: submission.reply() };
  const { entryId: target, reason } = submission.value;
  const done = await attempt(() => disqualifyEntry({ actorUserId: user.id, competition, entryId: target, reason, appUrl: env().APP_URL }));
  if (!done.ok) return data({ entryId, result: formReply(submission, done.error) }, { status: done.error.status });
  return { entryId, result: submission.reply({ resetForm: true }), mailed: done.value.mailed };
}

export default function CompetitionEntries({ loaderData }: Route.ComponentProps) {
  const actionData = useActionData<typeof action>();
  const nav = useNavigation();
  const { competition, event, rows } = loaderData;
  return (
    <div>
      <p className="kicker">
        <Link to={`/organize/${competition.id}`}>
          {event.title} · {competition.title}
        </Link>
      </p>
      <div className="mb-6 mt-1 flex flex-wrap items-center gap-3">
        <h1 className="text-display font-extrabold">Entries</h1>
        <StateBadge state={competition.state} />
      </div>
      {actionData && "mailed" in actionData && (
        <p role="status" className="mb-4 rounded-md bg-pass-soft px-3 py-2 text-sm font-medium text-pass">
          Disqualified; the reason was mailed to {actionData.mailed} crew member{actionData.mailed === 1 ? "" : "s"}.
        </p>
      )}
      <EntriesTable rows={rows} competitionId={competition.id} lastResult={actionData?.result} lastEntryId={actionData?.entryId} busy={nav.state !== "idle"} />
      <p className="mt-4 text-xs text-mute">Downloads are short-lived links straight from storage. Refunds follow the event's terms and local law.</p>
    </div>
  );
}

export { RouteErrorBoundary as ErrorBoundary } from "~/components/RouteErrorBoundary";

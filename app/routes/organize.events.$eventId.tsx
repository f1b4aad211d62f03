import { parseWithZod } from "@conform-to/zod/v4";
import { Link, useActionData, useNavigation } from "react-router";
import { requireEventRole } from "~/competitions/access.server";
import { eventFormSchema } from "~/competitions/forms";
import { competitionsOfEvent, updateEvent } from "~/competitions/service.server";
import { formatInZone, timeZoneNames, utcToZonedWallTime } from "~/competitions/timezone";
import { EventForm } from "~/competitions/ui/EventForm";
import { StateBadge } from "~/components/StateBadge";
import { attempt, formReply } from "~/errors/http.server";
import type { Route } from "./+types/organize.events.$eventId";
import { readForm } from "~/api/body.server";

export const meta: Route.MetaFunction = ({ data }) => [{ title: `${data?.event.title ?? "Event"} · Organize · Gatecrash` }];

export async function loader({ request, params, context }: Route.LoaderArgs) {
  const { event } = await requireEventRole(request, context, params.eventId, "organizer");
  const comps = await competitionsOfEvent(event.id);
  const wall = (d: Date | null) => (d ? utcToZonedWallTime(d, event.timeZone) : "");
  return {
    event: {
      id: event.id,
      title: event.title,
      slug: event.slug,
      description: event.description,
      venue: event.venue,
      timeZone: event.timeZone,
      startsAt: wall(event.startsAt),
      endsAt: wall(event.endsAt),
    },
    competitions: comps.map((c) => ({ id: c.id, title: c.title, slug: c.slug, state: c.state, deadline: c.deadlineAt ? formatInZone(c.deadlineAt, event.timeZone) : null })),
    timeZones: timeZoneNames(),
  };
}

export async function action({ request, params, context }: Route.ActionArgs) {
  const { user, event } = await requireEventRole(request, context, params.eventId, "organizer");
  const submission = parseWithZod(await readForm(request), { schema: eventFormSchema });
  if (submission.status !== "success") return submission.reply();
  const saved = await attempt(() => updateEvent(user.id, event.id, submission.value));
  if (!saved.ok) return formReply(submission, saved.error);
  return submission.reply();
}

export default function EditEvent({ loaderData }: Route.ComponentProps) {
  const lastResult = useActionData<typeof action>();
  const nav = useNavigation();
  const { event, competitions } = loaderData;
  const { id: _id, ...defaults } = event;
  return (
    <div className="mx-auto max-w-4xl">
      <p className="kicker">Event</p>
      <h1 className="mb-6 mt-1 text-display font-extrabold">{event.title}</h1>
      <section className="mb-8" aria-labelledby="comps-h">
        <div className="mb-3 flex items-center justify-between">
          <h2 id="comps-h" className="text-xl font-bold">
            Compos
          </h2>
          <div className="flex flex-wrap gap-2">
            <Link to={`/organize/events/${event.id}/party`} className="btn-quiet">
              Party desk: codes, awards, archive
            </Link>
            <Link to={`/organize/events/${event.id}/competitions/new`} className="btn-primary">
              New compo
            </Link>
          </div>
        </div>
        {competitions.length === 0 ? (
          <p className="text-mute">No compos yet.</p>
        ) : (
          <ul className="grid gap-3 sm:grid-cols-2">
            {competitions.map((c) => (
              <li key={c.id}>
                <Link to={`/organize/${c.id}`} className="card block hover:border-ink-soft">
                  <div className="flex items-center justify-between gap-2">
                    <span className="text-lg font-bold">{c.title}</span>
                    <StateBadge state={c.state} />
                  </div>
                  <div className="mt-1 text-sm text-ink-soft">{c.deadline ? `Deadline ${c.deadline}` : "No deadline yet"}</div>
                </Link>
              </li>
            ))}
          </ul>
        )}
      </section>
      <h2 className="mb-3 text-xl font-bold">Event details</h2>
      {lastResult?.status === "success" && (
        <p role="status" className="mb-4 rounded-md bg-pass-soft px-3 py-2 text-sm font-medium text-pass">
          Saved.
        </p>
      )}
      <EventForm lastResult={lastResult} defaultValue={defaults} submitLabel="Save event" busy={nav.state !== "idle"} timeZones={loaderData.timeZones} />
    </div>
  );
}

export { RouteErrorBoundary as ErrorBoundary } from "~/components/RouteErrorBoundary";

import { parseWithZod } from "@conform-to/zod/v4";
import { redirect, useActionData, useNavigation } from "react-router";
import { requireUser } from "~/auth/guards.server";
import { eventFormSchema } from "~/competitions/forms";
import { createEvent } from "~/competitions/service.server";
import { timeZoneNames } from "~/competitions/timezone";
import { EventForm } from "~/competitions/ui/EventForm";
import { attempt, formReply } from "~/errors/http.server";
import type { Route } from "./+types/organize.events.new";
import { readForm } from "~/api/body.server";

export const meta: Route.MetaFunction = () => [{ title: "New event · Gatecrash" }];

export async function loader({ request, context }: Route.LoaderArgs) {
  await requireUser(request, context);
  return { timeZones: timeZoneNames() };
}

export async function action({ request, context }: Route.ActionArgs) {
  const user = await requireUser(request, context);
  const submission = parseWithZod(await readForm(request), { schema: eventFormSchema });
  if (submission.status !== "success") return submission.reply();
  const saved = await attempt(() => createEvent(user.id, submission.value));
  if (!saved.ok) return formReply(submission, saved.error);
  return redirect(`/organize/events/${saved.value.id}`);
}

export default function NewEvent({ loaderData }: Route.ComponentProps) {
  const lastResult = useActionData<typeof action>();
  const nav = useNavigation();
  return (
    <div className="mx-auto max-w-3xl">
      <p className="kicker">Organizer</p>
      <h1 className="mb-6 mt-1 text-display font-extrabold">Announce an event</h1>
      <EventForm lastResult={lastResult} defaultValue={{ timeZone: "Europe/Berlin" }} submitLabel="Create event" busy={nav.state !== "idle"} timeZones={loaderData.timeZones} />
    </div>
  );
}

export { RouteErrorBoundary as ErrorBoundary } from "~/components/RouteErrorBoundary";

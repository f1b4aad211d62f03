import { parseWithZod } from "@conform-to/zod/v4";
import { redirect, useActionData, useNavigation } from "react-router";
import { DEMO_RULESET } from "~/rules/ruleset";
import { requireEventRole } from "~/competitions/access.server";
import { competitionFormSchema, competitionToForm, competitionValues } from "~/competitions/forms";
import { createCompetition } from "~/competitions/service.server";
import { CompetitionForm } from "~/competitions/ui/CompetitionForm";
import { attempt, formReply } from "~/errors/http.server";
import type { Route } from "./+types/organize.events.$eventId.competitions.new";
import { readForm } from "~/api/body.server";

export const meta: Route.MetaFunction = () => [{ title: "New compo · Gatecrash" }];

export async function loader({ request, params, context }: Route.LoaderArgs) {
  const { event } = await requireEventRole(request, context, params.eventId, "organizer");
  const defaults = competitionToForm(
    {
      title: "",
      slug: "",
      description: "",
      deadlineAt: null,
      graceMinutes: 5,
      votingOpensAt: null,
      votingClosesAt: null,
      showStartsAt: null,
      showMinutes: 60,
      feeAmount: 0,
      feeCurrency: "eur",
      ruleset: DEMO_RULESET,
      criteria: [],
    },
    event.timeZone,
  );
  defaults.criteria = [{ id: undefined as unknown as string, name: "Overall", weight: "1", scaleMin: "0", scaleMax: "10" }];
  return { event: { id: event.id, title: event.title, timeZone: event.timeZone }, defaults };
}

export async function action({ request, params, context }: Route.ActionArgs) {
  const { user, event } = await requireEventRole(request, context, params.eventId, "organizer");
  const submission = parseWithZod(await readForm(request), { schema: competitionFormSchema(event.timeZone) });
  if (submission.status !== "success") return submission.reply();
  const saved = await attempt(() => createCompetition(user.id, event.id, competitionValues(submission.value, event.timeZone)));
  if (!saved.ok) return formReply(submission, saved.error);
  return redirect(`/organize/${saved.value.id}`);
}

export default function NewCompetition({ loaderData }: Route.ComponentProps) {
  const lastResult = useActionData<typeof action>();
  const nav = useNavigation();
  return (
    <div className="mx-auto max-w-5xl">
      <p className="kicker">{loaderData.event.title}</p>
      <h1 className="mb-2 mt-1 text-display font-extrabold">New compo</h1>
      <p className="mb-6 text-ink-soft">It starts as a draft: only you see it until you open it for entries. The ruleset starts from Gatecrash's demo values.</p>
      <CompetitionForm lastResult={lastResult} defaultValue={loaderData.defaults} timeZone={loaderData.event.timeZone} submitLabel="Create compo" busy={nav.state !== "idle"} />
    </div>
  );
}

export { RouteErrorBoundary as ErrorBoundary } from "~/components/RouteErrorBoundary";

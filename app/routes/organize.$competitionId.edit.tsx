import { getFormProps, getTextareaProps, useForm, type SubmissionResult } from "@conform-to/react";
import { parseWithZod } from "@conform-to/zod/v4";
import { Form, Link, redirect, useActionData, useNavigation } from "react-router";
import { z } from "zod";
import { requireCompetitionRole } from "~/competitions/access.server";
import { competitionFormSchema, competitionToForm, competitionValues } from "~/competitions/forms";
import { parseRulesetJson } from "~/competitions/ruleset-io";
import { criteriaOf, FROZEN_STATES, importRuleset, storedRuleset, updateCompetition } from "~/competitions/service.server";
import { CompetitionForm } from "~/competitions/ui/CompetitionForm";
import { FieldError } from "~/competitions/ui/fields";
import { FormErrors } from "~/components/FormField";
import { attempt, formReply } from "~/errors/http.server";
import type { Route } from "./+types/organize.$competitionId.edit";
import { readForm } from "~/api/body.server";

export const meta: Route.MetaFunction = ({ data }) => [{ title: `Edit ${data?.competition.title ?? "compo"} · Gatecrash` }];

const importSchema = z.object({ intent: z.literal("import"), rulesetJson: z.string().optional() });

export async function loader({ request, params, context }: Route.LoaderArgs) {
  const { competition, event } = await requireCompetitionRole(request, context, params.competitionId, "organizer");
  const { ruleset } = storedRuleset(competition);
  const crit = await criteriaOf(competition.id);
  return {
    competition: { id: competition.id, title: competition.title, state: competition.state, rulesetVersion: competition.rulesetVersion },
    event: { id: event.id, title: event.title, timeZone: event.timeZone },
    frozen: FROZEN_STATES.includes(competition.state),
    defaults: competitionToForm({ ...competition, ruleset, criteria: crit }, event.timeZone),
  };
}

export async function action({ request, params, context }: Route.ActionArgs) {
  const { user, competition, event } = await requireCompetitionRole(request, context, params.competitionId, "organizer");
  const formData = await readForm(request);
  if (formData.get("intent") === "import") {
    const submission = parseWithZod(formData, { schema: importSchema });
    if (submission.status !== "success") return { form: "import" as const, result: submission.reply() };
    const file = formData.get("rulesetFile");
    let text = submission.value.rulesetJson ?? "";
    if (file instanceof File && file.size > 0) {
      if (file.size > 256 * 1024) return { form: "import" as const, result: submission.reply({ fieldErrors: { rulesetJson: ["The file is larger than 256 KiB; a ruleset is a few KiB."] } }) };
      text = await file.text();
    }
    const parsed = parseRulesetJson(text);
    if (!parsed.ok) return { form: "import" as const, result: submission.reply({ fieldErrors: { rulesetJson: parsed.errors } }) };
    const { ruleset } = parsed;
    const saved = await attempt(() => importRuleset(user.id, competition, ruleset));
    if (!saved.ok) return { form: "import" as const, result: formReply(submission, saved.error) };
    return redirect(`/organize/${competition.id}/edit?imported=${saved.value.version}`);
  }
  const submission = parseWithZod(formData, { schema: competitionFormSchema(event.timeZone) });
  if (submission.status !== "success") return { form: "competition" as const, result: submission.reply() };
  const values = competitionValues(submission.value, event.timeZone);
  const saved = await attempt(() => updateCompetition(user.id, competition, values));
  if (!saved.ok) return { form: "competition" as const, result: formReply(submission, saved.error) };
  return redirect(`/organize/${competition.id}?saved=1`);
}

function ImportForm({ lastResult, busy, frozen }: { lastResult: SubmissionResult<string[]> | undefined; busy: boolean; frozen: boolean }) {
  const [form, fields] = useForm<z.input<typeof importSchema>>({ id: "ruleset-import", lastResult });
  return (
    <Form method="post" encType="multipart/form-data" {...getFormProps(form)} className="card" aria-labelledby="import-h">
      <h2 id="import-h" className="mb-2 text-lg font-bold">Import or export the ruleset as JSON</h2>
      <p className="mb-4 text-sm text-mute">
        Export gives the stored ruleset with every default filled in. An import replaces the ruleset (a new ruleset version); fields it leaves out take the demo compo's
        values.
      </p>
      <FormErrors errors={form.errors} />
      <input type="hidden" name="intent" value="import" />
      <div className="mb-4">
        <label htmlFor="ruleset-file" className="label">
          Ruleset file (.json)
        </label>
        <input id="ruleset-file" name="rulesetFile" type="file" accept="application/json,.json" className="text-sm" disabled={frozen} />
      </div>
      <div className="mb-4">
        <label htmlFor={fields.rulesetJson.id} className="label">
          …or paste the JSON
        </label>
        <textarea {...getTextareaProps(fields.rulesetJson)} rows={6} className="field font-mono text-xs" disabled={frozen} aria-describedby={fields.rulesetJson.errors ? `${fields.rulesetJson.id}-error` : undefined} />
        {fields.rulesetJson.errors && (
          <ul id={`${fields.rulesetJson.id}-error`} role="alert" className="field-error list-disc pl-5">
            {fields.rulesetJson.errors.map((e) => (
              <li key={e}>{e}</li>
            ))}
          </ul>
        )}
        <FieldError field={fields.intent} />
      </div>
      <div className="flex gap-3">
        <button type="submit" className="btn-primary" disabled={busy || frozen}>
          Import ruleset
        </button>
      </div>
    </Form>
  );
}

export default function EditCompetition({ loaderData }: Route.ComponentProps) {
  const actionData = useActionData<typeof action>();
  const nav = useNavigation();
  const { competition, event, defaults, frozen } = loaderData;
  const imported = typeof window !== "undefined" ? new URLSearchParams(window.location.search).get("imported") : null;
  return (
    <div className="mx-auto max-w-5xl">
      <p className="kicker">{event.title}</p>
      <h1 className="mb-2 mt-1 text-display font-extrabold">Edit {competition.title}</h1>
      <p className="mb-6 text-sm text-ink-soft">
        Ruleset version {competition.rulesetVersion} ·{" "}
        <Link to={`/organize/${competition.id}`} className="font-semibold text-signal">
          Back to the dashboard
        </Link>{" "}
        ·{" "}
        <a href={`/organize/${competition.id}/ruleset.json`} className="font-semibold text-signal" download>
          Export ruleset.json
        </a>
      </p>
      {imported && (
        <p role="status" className="mb-4 rounded-md bg-pass-soft px-3 py-2 text-sm font-medium text-pass">
          Ruleset imported as version {imported}.
        </p>
      )}
      <CompetitionForm
        key={competition.rulesetVersion}
        lastResult={actionData?.form === "competition" ? actionData.result : undefined}
        defaultValue={defaults}
        timeZone={event.timeZone}
        submitLabel="Save compo"
        busy={nav.state !== "idle"}
        frozen={frozen}
      />
      <div className="mt-8">
        <ImportForm lastResult={actionData?.form === "import" ? actionData.result : undefined} busy={nav.state !== "idle"} frozen={frozen} />
      </div>
    </div>
  );
}

export { RouteErrorBoundary as ErrorBoundary } from "~/components/RouteErrorBoundary";

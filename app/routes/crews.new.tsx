import { getFormProps, useForm } from "@conform-to/react";
import { parseWithZod } from "@conform-to/zod/v4";
import { Form, redirect, useActionData, useNavigation } from "react-router";
import { requireUser } from "~/auth/guards.server";
import { safeRedirect } from "~/auth/redirect";
import { FormErrors, FormField } from "~/components/FormField";
import { crewFormSchema } from "~/crews/rules";
import { createCrew } from "~/crews/service.server";
import type { Route } from "./+types/crews.new";
import { readForm } from "~/api/body.server";
import { attempt, formReply } from "~/errors/http.server";

export const meta: Route.MetaFunction = () => [{ title: "New crew · Gatecrash" }];

const safeNext = (request: Request) => safeRedirect(new URL(request.url).searchParams.get("next"), null);

export async function loader({ request, context }: Route.LoaderArgs) {
  await requireUser(request, context);
  return { next: safeNext(request) };
}

export async function action({ request, context }: Route.ActionArgs) {
  const user = await requireUser(request, context);
  const submission = parseWithZod(await readForm(request), { schema: crewFormSchema });
  if (submission.status !== "success") return submission.reply();
  const out = await attempt(() => createCrew(user.id, submission.value));
  if (!out.ok) return formReply(submission, out.error);
  const next = safeNext(request);
  return redirect(next ?? `/crews/${out.value.id}`);
}

export default function NewCrew() {
  const lastResult = useActionData<typeof action>();
  const nav = useNavigation();
  const [form, fields] = useForm({ lastResult, shouldValidate: "onBlur", onValidate: ({ formData }) => parseWithZod(formData, { schema: crewFormSchema }) });
  return (
    <div className="mx-auto max-w-md">
      <p className="kicker">Entrant</p>
      <h1 className="mb-2 mt-1 text-display font-extrabold">Start a crew</h1>
      <p className="mb-6 text-ink-soft">A crew owns entries. You become its captain and can invite others by e-mail.</p>
      <Form method="post" {...getFormProps(form)} className="card">
        <FormErrors errors={form.errors} />
        <FormField field={fields.name} label="Crew name" hint="Shown with your entries, e.g. Beam Chasers." />
        <FormField field={fields.handle} label="Handle" hint="Unique, lowercase: letters, digits and dashes, e.g. beam-chasers." />
        <button type="submit" className="btn-primary w-full justify-center" disabled={nav.state !== "idle"}>
          Create crew
        </button>
      </Form>
    </div>
  );
}

export { RouteErrorBoundary as ErrorBoundary } from "~/components/RouteErrorBoundary";

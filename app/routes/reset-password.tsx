import { getFormProps, getInputProps, useForm } from "@conform-to/react";
import { parseWithZod } from "@conform-to/zod/v4";
import { Form, Link, useActionData, useSearchParams } from "react-router";
import { resetSchema } from "~/auth/forms";
import { callAuth } from "~/auth/forward.server";
import { FormErrors, FormField } from "~/components/FormField";
import type { Route } from "./+types/reset-password";
import { readForm } from "~/api/body.server";

export const meta: Route.MetaFunction = () => [{ title: "Choose a new password · Gatecrash" }];

export async function loader(_: Route.LoaderArgs) {
  return null;
}

export async function action({ request, context }: Route.ActionArgs) {
  const submission = parseWithZod(await readForm(request), { schema: resetSchema });
  if (submission.status !== "success") return { result: submission.reply({ hideFields: ["password"] }), done: false };
  const res = await callAuth(request, context, "/reset-password", { token: submission.value.token, newPassword: submission.value.password });
  if (res.status !== 200)
    return { result: submission.reply({ formErrors: ["This link has expired or was used already. Ask for a new one."], hideFields: ["password"] }), done: false };
  return { result: submission.reply(), done: true };
}

export default function ResetPassword() {
  const data = useActionData<typeof action>();
  const [params] = useSearchParams();
  const [form, fields] = useForm({ lastResult: data?.result, onValidate: ({ formData }) => parseWithZod(formData, { schema: resetSchema }) });
  if (data?.done)
    return (
      <div className="mx-auto max-w-md card" role="status">
        <h1 className="text-2xl font-extrabold">Password changed</h1>
        <Link to="/sign-in" className="btn-primary mt-4">
          Sign in
        </Link>
      </div>
    );
  return (
    <div className="mx-auto max-w-md">
      <h1 className="mb-6 text-display font-extrabold">Choose a new password</h1>
      <Form method="post" {...getFormProps(form)} className="card">
        <FormErrors errors={form.errors} />
        <input {...getInputProps(fields.token, { type: "hidden" })} value={params.get("token") ?? ""} />
        <FormField field={fields.password} label="New password" type="password" autoComplete="new-password" hint="At least 10 characters." />
        <button type="submit" className="btn-primary w-full justify-center">
          Save password
        </button>
      </Form>
    </div>
  );
}

export { RouteErrorBoundary as ErrorBoundary } from "~/components/RouteErrorBoundary";

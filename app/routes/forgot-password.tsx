import { getFormProps, useForm } from "@conform-to/react";
import { parseWithZod } from "@conform-to/zod/v4";
import { Form, useActionData } from "react-router";
import { forgotSchema } from "~/auth/forms";
import { callAuth } from "~/auth/forward.server";
import { FormErrors, FormField } from "~/components/FormField";
import type { Route } from "./+types/forgot-password";
import { readForm } from "~/api/body.server";

export const meta: Route.MetaFunction = () => [{ title: "Forgot password · Gatecrash" }];

export async function loader(_: Route.LoaderArgs) {
  return null;
}

export async function action({ request, context }: Route.ActionArgs) {
  const submission = parseWithZod(await readForm(request), { schema: forgotSchema });
  if (submission.status !== "success") return { result: submission.reply(), sent: false };
  const res = await callAuth(request, context, "/request-password-reset", { email: submission.value.email, redirectTo: "/reset-password" });
  if (res.status === 429) return { result: submission.reply({ formErrors: ["Too many requests. Wait a minute."] }), sent: false };
  // Same answer whether or not the address has an account, so the form cannot be used to probe addresses.
  return { result: submission.reply(), sent: true };
}

export default function ForgotPassword() {
  const data = useActionData<typeof action>();
  const [form, fields] = useForm({ lastResult: data?.result, onValidate: ({ formData }) => parseWithZod(formData, { schema: forgotSchema }) });
  return (
    <div className="mx-auto max-w-md">
      <h1 className="mb-6 text-display font-extrabold">New password</h1>
      {data?.sent ? (
        <p className="card" role="status">
          If an account uses that address, a link to choose a new password is on its way.
        </p>
      ) : (
        <Form method="post" {...getFormProps(form)} className="card">
          <FormErrors errors={form.errors} />
          <FormField field={fields.email} label="E-mail of your account" type="email" autoComplete="email" />
          <button type="submit" className="btn-primary w-full justify-center">
            Send me a link
          </button>
        </Form>
      )}
    </div>
  );
}

export { RouteErrorBoundary as ErrorBoundary } from "~/components/RouteErrorBoundary";

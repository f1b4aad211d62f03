import { getFormProps, useForm } from "@conform-to/react";
import { parseWithZod } from "@conform-to/zod/v4";
import { Form, Link, redirect, useActionData, useNavigation } from "react-router";
import { signUpSchema } from "~/auth/forms";
import { callAuth } from "~/auth/forward.server";
import { FormErrors, FormField } from "~/components/FormField";
import type { Route } from "./+types/sign-up";
import { readForm } from "~/api/body.server";

export const meta: Route.MetaFunction = () => [{ title: "Create an account · Gatecrash" }];

export async function loader(_: Route.LoaderArgs) {
  return null;
}

export async function action({ request, context }: Route.ActionArgs) {
  const submission = parseWithZod(await readForm(request), { schema: signUpSchema });
  if (submission.status !== "success") return submission.reply();
  const { name, email, password } = submission.value;
  const res = await callAuth(request, context, "/sign-up/email", { name, email, password, callbackURL: "/welcome" });
  if (res.status === 429) return submission.reply({ formErrors: ["Too many attempts from here. Wait a minute and try again."] });
  if (res.status >= 400) {
    const exists = res.body?.code === "USER_ALREADY_EXISTS" || res.body?.code === "USER_ALREADY_EXISTS_USE_ANOTHER_EMAIL";
    return submission.reply({
      fieldErrors: exists ? { email: ["An account with this address exists. Sign in, or reset its password."] } : {},
      formErrors: exists ? [] : [res.body?.message ?? "The account could not be created."],
    });
  }
  return redirect(`/check-your-mail?email=${encodeURIComponent(email)}`);
}

export default function SignUp() {
  const lastResult = useActionData<typeof action>();
  const nav = useNavigation();
  const [form, fields] = useForm({
    lastResult,
    shouldValidate: "onBlur",
    onValidate: ({ formData }) => parseWithZod(formData, { schema: signUpSchema }),
  });
  return (
    <div className="mx-auto max-w-md">
      <p className="kicker">Join the compo</p>
      <h1 className="mb-6 mt-1 text-display font-extrabold">Create your account</h1>
      <Form method="post" {...getFormProps(form)} className="card">
        <FormErrors errors={form.errors} />
        <FormField field={fields.name} label="Name or handle" autoComplete="nickname" />
        <FormField field={fields.email} label="E-mail" type="email" autoComplete="email" />
        <FormField field={fields.password} label="Password" type="password" autoComplete="new-password" hint="At least 10 characters." />
        <button type="submit" className="btn-primary w-full justify-center" disabled={nav.state !== "idle"}>
          Create account
        </button>
        <p className="mt-4 text-sm text-mute">
          We send a link to confirm your address. Already have an account? <Link to="/sign-in" className="font-semibold text-signal">Sign in</Link>
        </p>
      </Form>
    </div>
  );
}

export { RouteErrorBoundary as ErrorBoundary } from "~/components/RouteErrorBoundary";

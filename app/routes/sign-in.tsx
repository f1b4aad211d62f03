import { getFormProps, getInputProps, useForm } from "@conform-to/react";
import { parseWithZod } from "@conform-to/zod/v4";
import { data, Form, Link, redirect, useActionData, useNavigation, useSearchParams } from "react-router";
import { signInSchema } from "~/auth/forms";
import { callAuth, clientAddress, cookieHeaders } from "~/auth/forward.server";
import { clearSignInFailures, recordSignInFailure, signInBlocked } from "~/auth/sign-in-limit.server";
import { safeRedirect } from "~/auth/redirect";
import { getSession } from "~/auth/guards.server";
import { FormErrors, FormField } from "~/components/FormField";
import type { Route } from "./+types/sign-in";
import { readForm } from "~/api/body.server";

export const meta: Route.MetaFunction = () => [{ title: "Sign in · Gatecrash" }];

export async function loader({ request, context }: Route.LoaderArgs) {
  if (await getSession(context)) throw redirect(safeRedirect(new URL(request.url).searchParams.get("next"), "/"));
  return null;
}

export async function action({ request, context }: Route.ActionArgs) {
  const submission = parseWithZod(await readForm(request), { schema: signInSchema });
  if (submission.status !== "success") return submission.reply({ hideFields: ["password"] });
  const { email, password, next } = submission.value;
  const from = clientAddress(context);
  const wait = await signInBlocked(email, from);
  if (wait !== null) {
    const reply = submission.reply({ formErrors: [`Too many failed sign-ins for this account from here. Try again in ${Math.ceil(wait / 60)} min, or reset your password.`], hideFields: ["password"] });
    return data(reply, { status: 429, headers: { "Retry-After": String(wait) } });
  }
  const res = await callAuth(request, context, "/sign-in/email", { email, password });
  if (res.status === 200) {
    await clearSignInFailures(email, from);
    return redirect(safeRedirect(next, "/"), { headers: cookieHeaders(res) });
  }
  if (res.status === 401) await recordSignInFailure(email, from);
  const message =
    res.status === 429
      ? "Too many sign-in attempts. Wait a minute and try again."
      : res.body?.code === "EMAIL_NOT_VERIFIED"
        ? "Confirm your e-mail address first: we have sent you a fresh link."
        : "That e-mail and password do not match an account.";
  return submission.reply({ formErrors: [message], hideFields: ["password"] });
}

export default function SignIn() {
  const lastResult = useActionData<typeof action>();
  const nav = useNavigation();
  const [params] = useSearchParams();
  const [form, fields] = useForm({
    lastResult,
    shouldValidate: "onBlur",
    onValidate: ({ formData }) => parseWithZod(formData, { schema: signInSchema }),
  });
  return (
    <div className="mx-auto max-w-md">
      <p className="kicker">Welcome back</p>
      <h1 className="mb-6 mt-1 text-display font-extrabold">Sign in</h1>
      <Form method="post" {...getFormProps(form)} className="card">
        <FormErrors errors={form.errors} />
        <input {...getInputProps(fields.next, { type: "hidden" })} value={params.get("next") ?? ""} />
        <FormField field={fields.email} label="E-mail" type="email" autoComplete="email" />
        <FormField field={fields.password} label="Password" type="password" autoComplete="current-password" />
        <button type="submit" className="btn-primary w-full justify-center" disabled={nav.state !== "idle"}>
          Sign in
        </button>
        <div className="mt-4 flex justify-between text-sm">
          <Link to="/forgot-password" className="font-semibold text-signal">
            Forgot your password?
          </Link>
          <Link to="/sign-up" className="text-mute">
            Create an account
          </Link>
        </div>
      </Form>
    </div>
  );
}

export { RouteErrorBoundary as ErrorBoundary } from "~/components/RouteErrorBoundary";

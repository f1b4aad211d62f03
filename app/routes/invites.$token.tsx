import { Form, redirect, useActionData } from "react-router";
import { requireUser } from "~/auth/guards.server";
import { acceptInvite, INVITE_PROBLEM_TEXT, inviteByToken, inviteProblem } from "~/crews/service.server";
import type { Route } from "./+types/invites.$token";
import { actionError, attempt } from "~/errors/http.server";

export const meta: Route.MetaFunction = () => [{ title: "Crew invitation · Gatecrash" }];

export async function loader({ request, params, context }: Route.LoaderArgs) {
  await requireUser(request, context);
  const inv = await inviteByToken(params.token);
  const problem = inviteProblem(inv);
  return { problem: problem ? INVITE_PROBLEM_TEXT[problem] : null, crewName: problem ? null : inv?.crewName ?? null, handle: problem ? null : inv?.handle ?? null };
}

export async function action({ request, params, context }: Route.ActionArgs) {
  const user = await requireUser(request, context);
  const out = await attempt(() => acceptInvite(params.token, user.id));
  if (!out.ok) return actionError(out.error);
  return redirect(`/crews/${out.value.crewId}`);
}

export default function Invite({ loaderData }: Route.ComponentProps) {
  const result = useActionData<typeof action>();
  const problem = result?.error ?? loaderData.problem;
  return (
    <div className="mx-auto max-w-md">
      <p className="kicker">Crew invitation</p>
      {problem ? (
        <>
          <h1 className="mb-4 mt-1 text-display font-extrabold">This link does not work</h1>
          <p role="alert" className="text-ink-soft">{problem}</p>
        </>
      ) : (
        <>
          <h1 className="mb-4 mt-1 text-display font-extrabold">Join {loaderData.crewName}</h1>
          <p className="mb-6 text-ink-soft">You were invited to the crew @{loaderData.handle}. Joining lets you work on its entries and uploads.</p>
          <Form method="post">
            <button type="submit" className="btn-primary">Join the crew</button>
          </Form>
        </>
      )}
    </div>
  );
}

export { RouteErrorBoundary as ErrorBoundary } from "~/components/RouteErrorBoundary";

import { data, Form, Link, redirect } from "react-router";
import { requireUser } from "~/auth/guards.server";
import { pageCall } from "~/errors/http.server";
import { acceptInvite, findInvite } from "~/judging/jury.server";
import type { Route } from "./+types/judge-invites.$token";

export const meta: Route.MetaFunction = () => [{ title: "Jury invitation · Gatecrash" }];

export async function loader({ request, params, context }: Route.LoaderArgs) {
  const user = await requireUser(request, context);
  const invite = await findInvite(params.token);
  if (!invite) throw data({ message: "This invitation does not exist or was withdrawn." }, { status: 404 });
  return { eventTitle: invite.eventTitle, email: invite.email, state: invite.state, you: user.email, matches: invite.email.toLowerCase() === user.email.toLowerCase() };
}

export async function action({ request, params, context }: Route.ActionArgs) {
  const user = await requireUser(request, context);
  await pageCall(() => acceptInvite(params.token, user));
  throw redirect("/judging");
}

export default function JudgeInvite({ loaderData: l }: Route.ComponentProps) {
  return (
    <div className="mx-auto max-w-lg" data-testid="judge-invite">
      <p className="kicker text-violet">Jury invitation</p>
      <h1 className="mb-4 mt-1 text-display font-extrabold">Judge at {l.eventTitle}</h1>
      <div className="card">
        {l.state === "accepted" ? (
          <p>
            This invitation has been accepted. <Link to="/judging" className="font-semibold text-signal">Go to judging</Link>
          </p>
        ) : l.state === "expired" ? (
          <p>This invitation has expired. Ask the organizers for a new one.</p>
        ) : !l.matches ? (
          <p role="alert">
            This invitation was sent to <strong>{l.email}</strong>, but you are signed in as <strong>{l.you}</strong>. Sign out and sign in (or create an
            account) with the invited address to accept it.
          </p>
        ) : (
          <Form method="post">
            <p>The organizers invite you onto the jury. Accepting makes you a judge of this event; they then assign you to its compos.</p>
            <button type="submit" className="btn-primary mt-4">
              Accept and become a judge
            </button>
          </Form>
        )}
      </div>
    </div>
  );
}

export { RouteErrorBoundary as ErrorBoundary } from "~/components/RouteErrorBoundary";

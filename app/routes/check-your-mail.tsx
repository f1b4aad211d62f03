import { useSearchParams } from "react-router";
import type { Route } from "./+types/check-your-mail";

export const meta: Route.MetaFunction = () => [{ title: "Check your mail · Gatecrash" }];

export async function loader(_: Route.LoaderArgs) {
  return null;
}

export default function CheckYourMail() {
  const [params] = useSearchParams();
  return (
    <div className="mx-auto max-w-md card">
      <p className="kicker">One more step</p>
      <h1 className="mt-1 text-2xl font-extrabold">Check your mail</h1>
      <p className="mt-3 text-ink-soft">
        We sent a confirmation link to <strong>{params.get("email") ?? "your address"}</strong>. Open it to finish making
        your account; then you are signed in.
      </p>
    </div>
  );
}

export { RouteErrorBoundary as ErrorBoundary } from "~/components/RouteErrorBoundary";

import { isRouteErrorResponse, Link, useRouteError } from "react-router";

/** The error view of one route: the shell stays, the route's area explains what happened. */
export function RouteErrorBoundary() {
  const error = useRouteError();
  let status = 500;
  let message = "Something went wrong on our side. Nothing you entered was lost; try again.";
  if (isRouteErrorResponse(error)) {
    status = error.status;
    const data = error.data as { message?: string } | string | undefined;
    message =
      (typeof data === "object" && data?.message) ||
      (status === 404 ? "This page does not exist, or it is not public." : status === 403 ? "You do not have access to this page." : error.statusText);
  }
  return (
    <div className="mx-auto max-w-xl py-12 text-center" role="alert">
      <p className="kicker">Error {status}</p>
      <h1 className="mt-2 text-3xl font-extrabold">{status === 404 ? "Nothing here" : status === 403 ? "Not for you" : "That did not work"}</h1>
      <p className="mt-4 text-ink-soft">{message}</p>
      <Link to="/" className="btn-quiet mt-6">
        Back to the start
      </Link>
    </div>
  );
}
